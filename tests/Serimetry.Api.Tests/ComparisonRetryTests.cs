using System.Data.Common;
using System.Reflection;
using System.Text.Json;
using Hangfire;
using Hangfire.Common;
using Hangfire.States;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.Logging.Abstractions;
using Serimetry.Api.Hosting;
using Serimetry.Api.Jobs;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Tests;

/// <summary>
/// A passing metadata-store error inside a comparison job hands the attempt back to Hangfire for a retry; it neither
/// ends the comparison as failed nor leaves it without a further attempt. The store is a real SQLite file whose
/// connections fail on chosen opens with the error SQLite gives a writer that meets a lock (SQLITE_BUSY, code 5,
/// sqlite.org/rescode.html); the job is the service's own, run the way a Hangfire worker runs it.
/// </summary>
public sealed class ComparisonRetryTests : IDisposable
{
    private readonly string _dir = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_dir);

    /// <summary>SQLite in the test folder; the opens numbered in <see cref="FailOpens"/> (counted from arming) throw SQLITE_BUSY.</summary>
    private sealed class FlakyDialect(string path) : SqlDialect
    {
        private readonly SqliteDialect _inner = new(path);
        private int _opens;

        public HashSet<int> FailOpens { get; } = [];

        public void Arm() => _opens = 0;

        public override string Name => _inner.Name;
        public override string Describe => _inner.Describe;
        public override void PrepareSchema(DbConnection c) => _inner.PrepareSchema(c);

        public override DbConnection Open() =>
            FailOpens.Contains(++_opens) ? throw new SqliteException("database is locked", 5) : _inner.Open();
    }

    private sealed class NoJobs : IBackgroundJobClient
    {
        public string Create(Job job, IState state) => "0";
        public bool ChangeState(string jobId, IState state, string expectedState) => true;
    }

    private (ComparisonJob Job, MetadataStore Store, FlakyDialect Dialect) Setup()
    {
        var dialect = new FlakyDialect(Path.Combine(_dir, "serimetry.db"));
        var store = new MetadataStore(dialect);
        var job = new ComparisonJob(new DataPaths(_dir), store, new NoJobs(), NullLogger<ComparisonJob>.Instance);
        return (job, store, dialect);
    }

    /// <summary>A comparison of studies that have no folder: the engine refuses it (an input error) once it runs.</summary>
    private static string Queue(MetadataStore store, string? glandMaskId)
    {
        string id = Guid.NewGuid().ToString("N");
        var body = new ComparisonSubmission("no-such-baseline", ["no-such-followup"], glandMaskId, null, null);
        store.AddComparison(id, "P1", JsonSerializer.Serialize(body, ServiceJson.Options));
        return id;
    }

    private static void AssertRetriedByHangfire()
    {
        // The retry itself is Hangfire's: the job method must ask for retries, and fail the job only once they are spent.
        var retry = typeof(ComparisonJob).GetMethod(nameof(ComparisonJob.Run))!.GetCustomAttribute<AutomaticRetryAttribute>()!;
        Assert.True(retry.Attempts >= 3, $"{retry.Attempts} retries");
        Assert.Equal(AttemptsExceededAction.Fail, retry.OnAttemptsExceeded);
    }

    [Fact]
    public void Store_error_while_the_job_works_is_retried_not_reported_as_a_failed_comparison()
    {
        var (job, store, dialect) = Setup();
        using var _ = store;
        store.AddMask(new MaskRecord("m1", "no-such-baseline", "m1.nii.gz", "gland"));
        string id = Queue(store, "m1");
        // Opens of the attempt: 1 find the comparison, 2 mark it running, 3 look up the gland mask (inside the work).
        dialect.FailOpens.Add(3);
        dialect.Arm();
        Assert.ThrowsAny<DbException>(() => job.Run(id, null));
        var after = store.FindComparison(id)!;
        Assert.Equal("running", after.State);
        Assert.Null(after.ProblemJson);
        AssertRetriedByHangfire();

        // The retry (store answering again) does the work: here the engine refuses the missing studies, which ends it at once.
        dialect.FailOpens.Clear();
        job.Run(id, null);
        var ended = store.FindComparison(id)!;
        Assert.Equal("failed", ended.State);
        Assert.Equal(2, ended.Runs);
        Assert.Contains("input-", ended.ProblemJson, StringComparison.Ordinal);
        Assert.DoesNotContain("internal", ended.ProblemJson, StringComparison.Ordinal);
    }

    [Fact]
    public void Store_error_while_recording_a_failure_is_retried_until_the_failure_is_recorded()
    {
        var (job, store, dialect) = Setup();
        using var _ = store;
        string id = Queue(store, null);
        // Opens of the attempt: 1 find, 2 mark running, (the engine refuses the input without touching the store), 3 record the failure.
        dialect.FailOpens.Add(3);
        dialect.Arm();
        Assert.ThrowsAny<DbException>(() => job.Run(id, null));
        Assert.Equal("running", store.FindComparison(id)!.State);
        AssertRetriedByHangfire();

        dialect.FailOpens.Clear();
        job.Run(id, null);
        var ended = store.FindComparison(id)!;
        Assert.Equal("failed", ended.State);
        Assert.Contains("input-", ended.ProblemJson, StringComparison.Ordinal);
    }

    [Fact]
    public void Wrapped_store_errors_count_as_store_errors_and_engine_errors_do_not()
    {
        var busy = new SqliteException("database is locked", 5);
        Assert.True(ComparisonJob.IsStoreError(busy));
        Assert.True(ComparisonJob.IsStoreError(new AggregateException(new InvalidOperationException("x"), busy)));
        Assert.True(ComparisonJob.IsStoreError(new InvalidOperationException("progress", busy)));
        Assert.False(ComparisonJob.IsStoreError(new InvalidOperationException("engine")));
        Assert.False(ComparisonJob.IsStoreError(new Serimetry.Engine.Core.InputFormatException("bad", "here", "fix")));
    }
}
