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
        return c;
    }

    public override void PrepareSchema(DbConnection c)
    {
        Exec(c, "PRAGMA journal_mode=WAL;");
        Exec(c, Schema("BLOB", "REAL", "INTEGER PRIMARY KEY AUTOINCREMENT"));
    }
}
