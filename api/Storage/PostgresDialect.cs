using System.Data.Common;
using Npgsql;

namespace Serimetry.Api.Storage;

/// <summary>
/// The scale-out store: the tables live in the schema <c>serimetry</c> of a PostgreSQL database shared by every node
/// (Hangfire keeps its own tables in the schema <c>hangfire</c> of the same database). Connections come from one
/// Npgsql data source (its pool).
/// </summary>
internal sealed class PostgresDialect : SqlDialect, IDisposable
{
    /// <summary>Key of the transaction-level advisory lock that serialises schema creation between nodes starting together.</summary>
    private const long SchemaLockKey = 0x5345_5249_4D45_5459; // "SERIMETY"

    private readonly NpgsqlDataSource _source;
    private readonly string _describe;

    public PostgresDialect(string connectionString)
    {
        var b = new NpgsqlConnectionStringBuilder(connectionString) { SearchPath = "serimetry" };
        _describe = $"postgres://{b.Host}:{b.Port}/{b.Database}";
        _source = NpgsqlDataSource.Create(b);
    }

    public override string Name => "postgres";

    public override string Describe => _describe;

    public override DbConnection Open() => _source.OpenConnection();

    public override void PrepareSchema(DbConnection c)
    {
        // CREATE … IF NOT EXISTS is not safe against a concurrent CREATE (both may pass the check and one then fails on
        // a unique catalog index), so nodes starting together take turns.
        using var tx = c.BeginTransaction();
        Exec(c, $"SELECT pg_advisory_xact_lock({SchemaLockKey}); CREATE SCHEMA IF NOT EXISTS serimetry;");
        Exec(c, Schema("BYTEA", "DOUBLE PRECISION", "BIGINT GENERATED ALWAYS AS IDENTITY PRIMARY KEY"));
        Exec(c, "ALTER TABLE masks ADD COLUMN IF NOT EXISTS role TEXT;");
        tx.Commit();
    }

    public void Dispose() => _source.Dispose();
}
