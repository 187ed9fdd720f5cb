using System.Data.Common;
using System.Globalization;
using System.Text.Json;
using Hangfire;
using Hangfire.Server;
using Serimetry.Api.Hosting;
using Serimetry.Api.Storage;
using Serimetry.Engine.Change;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Api.Jobs;

/// <summary>
/// The durable comparison job, run by a Hangfire worker. Hangfire keeps the job in its storage until a worker
/// finishes it; a job whose worker died is fetched again after the invisibility timeout. The job is idempotent:
/// outputs are written to a scratch folder and renamed into <c>comparisons/&lt;id&gt;</c> in one step, and a job whose
/// folder or final state already exists ends at once, so a retried job never produces a second result.
/// Errors of the metadata store (<see cref="DbException"/>: SQLite, PostgreSQL) are passing: the attempt is given back
/// to Hangfire, which runs it again with back-off (<see cref="Retries"/> times); only when those retries are spent is the
/// comparison ended as failed. Engine errors end it as failed at once.
/// </summary>
public sealed class ComparisonJob(DataPaths paths, MetadataStore store, IBackgroundJobClient jobs, ILogger<ComparisonJob> log)
{
    /// <summary>How often Hangfire runs the job again after a store error (delays 10 s, 30 s, 90 s, 4.5 min, 10 min).</summary>
    public const int Retries = 5;

    /// <summary>
    /// Runs comparison <paramref name="comparisonId"/>. <paramref name="context"/> is Hangfire's (it passes its own;
    /// enqueue with null), read for the retry count.
    /// </summary>
    [AutomaticRetry(Attempts = Retries, DelaysInSeconds = [10, 30, 90, 270, 600], OnAttemptsExceeded = AttemptsExceededAction.Fail)]
    public void Run(string comparisonId, PerformContext? context)
    {
        try { RunAttempt(comparisonId); }
        catch (Exception e) when (IsStoreError(e))
        {
            int retries = context?.GetJobParameter<int>("RetryCount") ?? 0;
            bool last = retries >= Retries;
            // Type only: provider messages may quote SQL values.
            log.LogWarning("comparison {ComparisonId}: the metadata store failed with {ErrorType} (retry {Retry} of {Retries}){Then}",
                comparisonId, e.GetType().FullName, retries, Retries, last ? "; no retries left, ending it as failed" : "; it runs again later");
            if (last) EndAfterStoreFailure(comparisonId);
            throw; // Hangfire schedules the next attempt (or records the job as failed after the last)
        }
    }

    /// <summary>True for an error of the metadata store, also when the engine wrapped it (a progress write fails inside it).</summary>
    internal static bool IsStoreError(Exception e) => e switch
    {
        DbException => true,
        AggregateException a => a.InnerExceptions.Any(IsStoreError),
        _ => e.InnerException is { } inner && IsStoreError(inner),
    };

    private void RunAttempt(string comparisonId)
    {
        var rec = store.FindComparison(comparisonId);
        if (rec is null || rec.State is "done" or "failed") return;
        string final = Path.Combine(paths.Comparisons, comparisonId);
        // An earlier attempt renamed its result into place but died before recording it: record it, compute nothing.
        if (File.Exists(Path.Combine(final, "change.json")))
        {
            var earlier = JsonSerializer.Deserialize<ComparisonSubmission>(rec.RequestJson, ServiceJson.Options)!;
            if (Complete(comparisonId, "done", null) && earlier.Options?.StoreResults == true) jobs.Enqueue<ResultStoreJob>(j => j.Store(comparisonId));
            return;
        }
        if (!store.StartComparison(comparisonId)) return;
        RemoveLeftovers(comparisonId);
        log.LogInformation("comparison {ComparisonId} started (attempt {Attempt})", comparisonId, rec.Runs + 1);
        var submission = JsonSerializer.Deserialize<ComparisonSubmission>(rec.RequestJson, ServiceJson.Options)!;
        Execute(comparisonId, submission, final);
        // Ended (done or failed): tell the caller. A store error above skips this; the retry that ends it notifies.
        if (submission.CallbackUrl is not null) jobs.Enqueue<CallbackJob>(j => j.Notify(comparisonId));
    }

    /// <summary>The last attempt met a store error: end the comparison as failed when the store answers again (best effort).</summary>
    private void EndAfterStoreFailure(string comparisonId)
    {
        try
        {
            var rec = store.FindComparison(comparisonId);
            if (Complete(comparisonId, "failed", Problems.Document(503, "store-unavailable", "Comparison failed",
                    "the metadata store failed on every attempt; submit the comparison again").ToJsonString())
                && rec is not null && JsonSerializer.Deserialize<ComparisonSubmission>(rec.RequestJson, ServiceJson.Options)?.CallbackUrl is not null)
                jobs.Enqueue<CallbackJob>(j => j.Notify(comparisonId));
        }
        catch (Exception e) when (IsStoreError(e))
        {
            log.LogError("comparison {ComparisonId} could not be ended: the metadata store still fails ({ErrorType})", comparisonId, e.GetType().FullName);
        }
    }

    private void Execute(string comparisonId, ComparisonSubmission submission, string final)
    {
        try
        {
            var request = BuildRequest(submission);
            var result = ComparePipeline.Run(request, new StoreProgress(store, comparisonId));
            store.Progress(comparisonId, "writing outputs", 99);
            string tmp = Path.Combine(paths.Incoming, $"cmp-{comparisonId}-{Guid.NewGuid():N}");
            CompareOutputs.Write(result, tmp);
            // One rename publishes the whole result (readers see all files or none); when another attempt published
            // first, rename(2) onto its non-empty folder fails and this attempt's copy is dropped: one result, never two.
            try { Directory.Move(tmp, final); }
            catch (IOException) when (Directory.Exists(final)) { Directory.Delete(tmp, recursive: true); }
            if (Complete(comparisonId, "done", null) && submission.Options?.StoreResults == true)
                jobs.Enqueue<ResultStoreJob>(j => j.Store(comparisonId));
        }
        catch (InputException e)
        {
            Complete(comparisonId, "failed", ServiceTerms.Problem(e).ToJsonString());
            log.LogWarning("comparison {ComparisonId} failed: input problem of kind {Kind}", comparisonId, e.Kind);
        }
        catch (Exception e) when (e is not OutOfMemoryException && !IsStoreError(e))
        {
            Complete(comparisonId, "failed",
                Problems.Document(500, "internal", "Comparison failed", "the engine failed; the service log has the error type").ToJsonString());
            log.LogError("comparison {ComparisonId} failed with {ErrorType}", comparisonId, e.GetType().FullName);
        }
    }

    /// <summary>Records the end state once (true); a second attempt that finds it ended leaves it as it is (false).</summary>
    private bool Complete(string comparisonId, string state, string? problemJson)
    {
        bool ended = store.FinishComparison(comparisonId, state, problemJson);
        if (ended) log.LogInformation("comparison {ComparisonId} {State}", comparisonId, state);
        else log.LogInformation("comparison {ComparisonId} had already ended; this attempt changes nothing", comparisonId);
        return ended;
    }

    /// <summary>Deletes scratch folders of earlier attempts (a re-run means their node is gone).</summary>
    private void RemoveLeftovers(string comparisonId)
    {
        foreach (var d in Directory.GetDirectories(paths.Incoming, $"cmp-{comparisonId}-*"))
        {
            try { Directory.Delete(d, recursive: true); }
            catch (IOException) { } // still in use: ScratchCleanup removes it later
        }
    }

    private CompareRequest BuildRequest(ComparisonSubmission s)
    {
        string Study(string id) => Path.Combine(paths.Studies, id);
        string? Mask(string? id) => id is null ? null : Path.Combine(paths.Masks, store.FindMask(id)!.File);
        var psa = (s.Psa ?? []).Select(p => new PsaSample(DateOnly.ParseExact(p.Date, "yyyy-MM-dd", CultureInfo.InvariantCulture), p.Value)).ToList();
        // Same defaults as 'serimetry compare' without options, so the service and the CLI give the same change.json.
        var o = s.Options ?? new ComparisonSettings();
        var options = new ComparisonOptions(
            AllowDifferentPatients: o.AllowDifferentPatients ?? false,
            FollowupPreset: o.FollowupPreset ?? "rigid",
            WithinExamPreset: o.WithinExam == false ? null : "within-exam",
            Radiomics: o.Radiomics == false ? null : new RadiomicsSettings());
        return new CompareRequest(Study(s.BaselineStudyId!), s.FollowupStudyIds!.Select(Study).ToList(), Mask(s.GlandMaskId), Mask(s.LesionMaskId),
            psa, RepeatabilityProfile.LoadDefault(), options);
    }

    /// <summary>Stores stage and percent, at most once per whole percent or stage change (synchronous, in order).</summary>
    private sealed class StoreProgress(MetadataStore store, string id) : IProgress<CompareProgress>
    {
        private string _stage = "";
        private int _percent = -1;

        public void Report(CompareProgress value)
        {
            int p = (int)Math.Floor(value.Fraction * 100);
            if (p == _percent && value.Stage == _stage) return;
            (_stage, _percent) = (value.Stage, p);
            store.Progress(id, value.Stage, Math.Min(p, 98));
        }
    }
}
