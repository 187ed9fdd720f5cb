using System.Data.Common;
using Microsoft.Data.Sqlite;

namespace Serimetry.Api.Storage;

/// <summary>The embedded default: one SQLite file in the data folder, in WAL mode (readers never block the writer).</summary>
internal sealed class SqliteDialect(string path) : SqlDialect
{
    private readonly string _connectionString = new SqliteConnectionStringBuilder
    {
        DataSource = path, Mode = SqliteOpenMode.ReadWriteCreate, Pooling = true, DefaultTimeout = 30,
    }.ToString();

    public override string Name => "sqlite";

    public override string Describe => path;

    public override DbConnection Open()
    {
        var c = new SqliteConnection(_connectionString);
        c.Open();
        // SQLite's own busy handler waits for the write lock in millisecond steps; without it a writer that meets a lock
        // gets SQLITE_BUSY back and the provider retries only after a long sleep (a status poll writes an audit row,
        // so concurrent polls meet the lock often: seconds of p99 latency in the status-load benchmark).
        using var busy = c.CreateCommand();
        busy.CommandText = "PRAGMA busy_timeout = 30000;";
        busy.ExecuteNonQuery();
        return c;
    }

    public override void PrepareSchema(DbConnection c)
    {
        Exec(c, "PRAGMA journal_mode=WAL;");
        Exec(c, Schema("BLOB", "REAL", "INTEGER PRIMARY KEY AUTOINCREMENT"));
        AddColumnIfMissing(c, "masks", "role", "TEXT");
    }

    /// <summary>Upgrades a database made by an earlier version (SQLite has no ADD COLUMN IF NOT EXISTS).</summary>
    private static void AddColumnIfMissing(DbConnection c, string table, string column, string type)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = $"SELECT COUNT(*) FROM pragma_table_info('{table}') WHERE name = '{column}'";
        if (Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) == 0)
            Exec(c, $"ALTER TABLE {table} ADD COLUMN {column} {type}");
    }
}
