using Microsoft.Data.Sqlite;

namespace Serimetry.Api.Storage;

/// <summary>
/// Metadata of the service in one SQLite database (WAL mode, one connection per operation so request threads and
/// job workers never share one): studies, masks, comparisons, API keys and the audit log.
/// </summary>
public sealed partial class MetadataStore
{
    private readonly string _connectionString;

    /// <summary>Opens (creating when missing) the database at <paramref name="path"/>.</summary>
    public MetadataStore(string path)
    {
        _connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = path, Mode = SqliteOpenMode.ReadWriteCreate, Pooling = true, DefaultTimeout = 30,
        }.ToString();
        using var c = Open();
        Exec(c, "PRAGMA journal_mode=WAL;");
        Exec(c, Schema);
        AddColumnIfMissing(c, "masks", "role", "TEXT");
    }

    /// <summary>Upgrades a database made by an earlier version (SQLite has no ADD COLUMN IF NOT EXISTS).</summary>
    private static void AddColumnIfMissing(SqliteConnection c, string table, string column, string type)
    {
        using var cmd = Command(c, $"SELECT COUNT(*) FROM pragma_table_info('{table}') WHERE name = $n", [("$n", column)]);
        if (Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) == 0)
            Exec(c, $"ALTER TABLE {table} ADD COLUMN {column} {type}");
    }

    private const string Schema = """
        CREATE TABLE IF NOT EXISTS keys (id TEXT PRIMARY KEY, name TEXT NOT NULL, salt BLOB NOT NULL, hash BLOB NOT NULL, created TEXT NOT NULL);
        CREATE TABLE IF NOT EXISTS studies (id TEXT PRIMARY KEY, patient_id TEXT, study_date TEXT, kind TEXT NOT NULL,
            series_json TEXT NOT NULL, created TEXT NOT NULL);
        CREATE TABLE IF NOT EXISTS masks (id TEXT PRIMARY KEY, study_id TEXT NOT NULL, file TEXT NOT NULL, created TEXT NOT NULL, role TEXT);
        CREATE TABLE IF NOT EXISTS comparisons (id TEXT PRIMARY KEY, patient_id TEXT, request_json TEXT NOT NULL, state TEXT NOT NULL,
            stage TEXT, percent REAL NOT NULL DEFAULT 0, problem_json TEXT, runs INTEGER NOT NULL DEFAULT 0,
            created TEXT NOT NULL, finished TEXT);
        CREATE INDEX IF NOT EXISTS comparisons_patient ON comparisons(patient_id);
        CREATE TABLE IF NOT EXISTS audit (seq INTEGER PRIMARY KEY AUTOINCREMENT, at TEXT NOT NULL, key_name TEXT NOT NULL,
            action TEXT NOT NULL, resource TEXT NOT NULL);
        """;

    private SqliteConnection Open()
    {
        var c = new SqliteConnection(_connectionString);
        c.Open();
        return c;
    }

    private static void Exec(SqliteConnection c, string sql, params (string Name, object? Value)[] args)
    {
        using var cmd = Command(c, sql, args);
        cmd.ExecuteNonQuery();
    }

    private static SqliteCommand Command(SqliteConnection c, string sql, (string Name, object? Value)[] args)
    {
        var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        foreach (var (n, v) in args) cmd.Parameters.AddWithValue(n, v ?? DBNull.Value);
        return cmd;
    }

    private int Execute(string sql, params (string Name, object? Value)[] args)
    {
        using var c = Open();
        using var cmd = Command(c, sql, args);
        return cmd.ExecuteNonQuery();
    }

    private List<T> Query<T>(string sql, Func<SqliteDataReader, T> map, params (string Name, object? Value)[] args)
    {
        using var c = Open();
        using var cmd = Command(c, sql, args);
        using var r = cmd.ExecuteReader();
        var list = new List<T>();
        while (r.Read()) list.Add(map(r));
        return list;
    }

    private static string Now() => DateTimeOffset.UtcNow.ToString("O", System.Globalization.CultureInfo.InvariantCulture);

    private static string? Str(SqliteDataReader r, int i) => r.IsDBNull(i) ? null : r.GetString(i);

    /// <summary>Appends an audit record: which key did what to which resource (ids only, never patient data).</summary>
    public void Audit(string keyName, string action, string resource) =>
        Execute("INSERT INTO audit (at, key_name, action, resource) VALUES ($at, $k, $a, $r)",
            ("$at", Now()), ("$k", keyName), ("$a", action), ("$r", resource));

    /// <summary>The audit log, oldest first.</summary>
    public IReadOnlyList<AuditRecord> AuditLog() =>
        Query("SELECT at, key_name, action, resource FROM audit ORDER BY seq", r => new AuditRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3)));
}

/// <summary>One audit record.</summary>
public sealed record AuditRecord(string At, string KeyName, string Action, string Resource);
