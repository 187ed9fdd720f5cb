using System.Data.Common;
using Serimetry.Api.Hosting;
using Serimetry.Engine.Core;

namespace Serimetry.Api.Storage;

/// <summary>
/// Metadata of the service: studies, masks, comparisons, API keys and the audit log. One contract, two databases:
/// the embedded default is SQLite in the data folder, the scale-out store is PostgreSQL shared by every node
/// (<see cref="SqlDialect"/> holds what differs; the queries are shared). One pooled connection per operation, so
/// request threads and job workers never share one. Every change is a single statement, atomic on its own; the
/// state changes of a comparison are conditional, so two nodes racing on one comparison cannot both finish it.
/// </summary>
public sealed partial class MetadataStore : IDisposable
{
    private readonly SqlDialect _dialect;

    internal MetadataStore(SqlDialect dialect)
    {
        _dialect = dialect;
        try
        {
            using var c = dialect.Open();
            dialect.PrepareSchema(c);
        }
        catch (DbException e)
        {
            (dialect as IDisposable)?.Dispose();
            // The provider's message names host, port or the refused login, never the password.
            throw new InvalidParameterException($"cannot open the {dialect.Name} metadata store at {dialect.Describe}: {e.Message}",
                dialect.Name == "postgres" ? "Serimetry:Connection" : "Serimetry:DataDir",
                dialect.Name == "postgres" ? "check the connection string (host, port, database, user, password) and that the server runs"
                    : "check that the data folder is writable", e);
        }
    }

    /// <summary>Opens (creating when missing) the SQLite database at <paramref name="path"/>.</summary>
    public static MetadataStore Sqlite(string path) => new(new SqliteDialect(path));

    /// <summary>Opens the PostgreSQL database of <paramref name="connectionString"/> (Npgsql syntax), creating the tables when missing.</summary>
    public static MetadataStore Postgres(string connectionString) => new(new PostgresDialect(connectionString));

    /// <summary>The store <paramref name="options"/> name: SQLite in the data folder, or PostgreSQL at <see cref="ServiceOptions.Connection"/>.</summary>
    public static MetadataStore Open(ServiceOptions options, DataPaths paths) => options.Store switch
    {
        "sqlite" => Sqlite(paths.MetadataDb),
        "postgres" => Postgres(options.Connection ?? throw new InvalidParameterException(
            "the postgres store needs a connection string", "Serimetry:Connection",
            "pass --connection \"Host=…;Port=5432;Database=…;Username=…;Password=…\" (or set Serimetry__Connection)")),
        _ => throw new InvalidParameterException($"unknown store '{options.Store}'", "Serimetry:Store", "use --store sqlite or --store postgres"),
    };

    /// <summary>Which database this is (sqlite or postgres).</summary>
    public string Kind => _dialect.Name;

    /// <summary>Where the metadata lives (file path, or postgres host/port/database), without credentials.</summary>
    public string Location => _dialect.Describe;

    private static DbCommand Command(DbConnection c, string sql, (string Name, object? Value)[] args)
    {
        var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        foreach (var (n, v) in args)
        {
            var p = cmd.CreateParameter();
            p.ParameterName = n;
            p.Value = v ?? DBNull.Value;
            cmd.Parameters.Add(p);
        }
        return cmd;
    }

    private int Execute(string sql, params (string Name, object? Value)[] args)
    {
        using var c = _dialect.Open();
        using var cmd = Command(c, sql, args);
        return cmd.ExecuteNonQuery();
    }

    private List<T> Query<T>(string sql, Func<DbDataReader, T> map, params (string Name, object? Value)[] args)
    {
        using var c = _dialect.Open();
        using var cmd = Command(c, sql, args);
        using var r = cmd.ExecuteReader();
        var list = new List<T>();
        while (r.Read()) list.Add(map(r));
        return list;
    }

    private static string Now() => DateTimeOffset.UtcNow.ToString("O", System.Globalization.CultureInfo.InvariantCulture);

    private static string? Str(DbDataReader r, int i) => r.IsDBNull(i) ? null : r.GetString(i);

    /// <summary>Appends an audit record: which key did what to which resource (ids only, never patient data).</summary>
    public void Audit(string keyName, string action, string resource) =>
        Execute("INSERT INTO audit (at, key_name, action, resource) VALUES (@at, @k, @a, @r)",
            ("@at", Now()), ("@k", keyName), ("@a", action), ("@r", resource));

    /// <summary>The audit log, oldest first.</summary>
    public IReadOnlyList<AuditRecord> AuditLog() =>
        Query("SELECT at, key_name, action, resource FROM audit ORDER BY seq", r => new AuditRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3)));

    /// <summary>Releases the connection pool of the PostgreSQL store (SQLite needs nothing).</summary>
    public void Dispose() => (_dialect as IDisposable)?.Dispose();
}

/// <summary>One audit record.</summary>
public sealed record AuditRecord(string At, string KeyName, string Action, string Resource);
