using System.Text.Json;
using Hangfire;
using Serimetry.Api.Hosting;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Jobs;

/// <summary>Queues a validated comparison: its row (state queued) and its durable job. Used by the endpoint and the DICOM trigger rule.</summary>
public static class ComparisonQueue
{
    /// <summary>Stores the request and enqueues the job; returns the new comparison id.</summary>
    public static string Enqueue(MetadataStore store, IBackgroundJobClient jobs, ComparisonSubmission body)
    {
        string id = Guid.NewGuid().ToString("N");
        var patient = store.FindStudy(body.BaselineStudyId!)!.PatientId;
        store.AddComparison(id, patient, JsonSerializer.Serialize(body, ServiceJson.Options));
        jobs.Enqueue<ComparisonJob>(j => j.Run(id, null));
        return id;
    }
}
