using System.Data.Common;

namespace Serimetry.Api.Storage;

/// <summary>
/// What differs between the metadata databases: how a connection is opened and how the schema is created (column
/// types, auto-numbering, concurrent creation by several nodes). The queries themselves are shared: they use
/// named parameters (<c>@name</c>), <c>INSERT … ON CONFLICT DO NOTHING</c> and plain types that both SQLite (3.24+)
/// and PostgreSQL accept.
/// </summary>
internal abstract class SqlDialect
{
    /// <summary>Short name for messages (sqlite, postgres).</summary>
    public abstract string Name { get; }

    /// <summary>Where the metadata lives, without secrets (a file path, or host/port/database).</summary>
    public abstract string Describe { get; }

    /// <summary>An open connection (pooled by the provider); one per operation, never shared between threads.</summary>
    public abstract DbConnection Open();

    /// <summary>Creates the tables when missing; safe when several nodes start at once.</summary>
    public abstract void PrepareSchema(DbConnection c);

    /// <summary>Runs one statement without results.</summary>
    protected static void Exec(DbConnection c, string sql)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        cmd.ExecuteNonQuery();
    }

    /// <summary>The tables, with the dialect's names for binary, floating-point and auto-numbered columns.</summary>
    protected static string Schema(string blob, string real, string autoKey) => $"""
        CREATE TABLE IF NOT EXISTS keys (id TEXT PRIMARY KEY, name TEXT NOT NULL, salt {blob} NOT NULL, hash {blob} NOT NULL, created TEXT NOT NULL);
        CREATE TABLE IF NOT EXISTS studies (id TEXT PRIMARY KEY, patient_id TEXT, study_date TEXT, kind TEXT NOT NULL,
            series_json TEXT NOT NULL, created TEXT NOT NULL);
        CREATE TABLE IF NOT EXISTS masks (id TEXT PRIMARY KEY, study_id TEXT NOT NULL, file TEXT NOT NULL, created TEXT NOT NULL, role TEXT);
        CREATE TABLE IF NOT EXISTS comparisons (id TEXT PRIMARY KEY, patient_id TEXT, request_json TEXT NOT NULL, state TEXT NOT NULL,
            stage TEXT, percent {real} NOT NULL DEFAULT 0, problem_json TEXT, runs INTEGER NOT NULL DEFAULT 0,
            created TEXT NOT NULL, finished TEXT);
        CREATE INDEX IF NOT EXISTS comparisons_patient ON comparisons(patient_id);
        CREATE TABLE IF NOT EXISTS audit (seq {autoKey}, at TEXT NOT NULL, key_name TEXT NOT NULL,
            action TEXT NOT NULL, resource TEXT NOT NULL);
        """;
}
