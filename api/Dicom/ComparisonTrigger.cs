using System.Text.Json;
using System.Text.Json.Nodes;
using Hangfire;
using Serimetry.Api.Hosting;
using Serimetry.Api.Jobs;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Dicom;

/// <summary>
/// The trigger rule for studies received over DICOM (docs/dicom-network.md): when the received study belongs to a
/// patient who already has a study with an earlier study date, both with a T2w series, and the baseline (the earliest
/// study) has a gland mask on file, a comparison is queued: baseline = earliest study, follow-ups = every later study
/// date. Per study date the most recently stored study counts (a study indexed again after more series arrived
/// supersedes its earlier part). The same comparison is never queued twice.
/// </summary>
internal sealed class ComparisonTrigger(MetadataStore store, IBackgroundJobClient jobs, ILogger<ComparisonTrigger> log)
{
    /// <summary>Applies the rule after <paramref name="received"/> was indexed; the queued comparison's id, or null.</summary>
    public string? Consider(StudyRecord received)
    {
        if (received.PatientId is null || received.StudyDate is null || !HasT2w(received)) return null;
        var visits = store.StudiesOfPatient(received.PatientId).Select(s => s.Study)
            .Where(s => s.StudyDate is not null && HasT2w(s))
            .GroupBy(s => s.StudyDate!, StringComparer.Ordinal).Select(g => g.Last())
            .OrderBy(s => s.StudyDate, StringComparer.Ordinal).ToList();
        if (visits.Count < 2 || visits[0].Id == received.Id || !visits.Any(v => v.Id == received.Id)) return null;
        var baseline = visits[0];
        var masks = store.MasksOfStudy(baseline.Id);
        var gland = masks.LastOrDefault(m => m.Role == "gland");
        if (gland is null)
        {
            log.LogInformation("study {StudyId} has an earlier study {BaselineId} on file but no gland mask for it: no comparison queued",
                received.Id, baseline.Id);
            return null;
        }
        var followups = visits.Skip(1).Select(v => v.Id).ToList();
        if (AlreadyQueued(received.PatientId, baseline.Id, followups)) return null;
        var body = new ComparisonSubmission(baseline.Id, followups, gland.Id, masks.LastOrDefault(m => m.Role == "lesion")?.Id, null);
        string id = ComparisonQueue.Enqueue(store, jobs, body);
        store.Audit("dicom-rule", "submit-comparison", id);
        log.LogInformation("comparison {ComparisonId} queued by the DICOM rule: baseline study {BaselineId}, {Followups} follow-up studies, latest {StudyId}",
            id, baseline.Id, followups.Count, received.Id);
        return id;
    }

    private bool AlreadyQueued(string patientId, string baselineId, List<string> followups) =>
        store.ComparisonsOfPatient(patientId).Any(c =>
        {
            var s = JsonSerializer.Deserialize<ComparisonSubmission>(c.RequestJson, ServiceJson.Options);
            return s?.BaselineStudyId == baselineId && s.FollowupStudyIds is { } f && f.SequenceEqual(followups);
        });

    /// <summary>True when the study's indexed series include a T2w one (DICOM and NIfTI studies both store "role").</summary>
    internal static bool HasT2w(StudyRecord s) =>
        JsonNode.Parse(s.SeriesJson) is JsonArray a && a.Any(n => (string?)n?["role"] == "t2w");
}
