using System.Text.Json.Nodes;
using Hangfire;
using Serimetry.Api.Hosting;
using Serimetry.Api.Storage;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Api.Jobs;

/// <summary>
/// Stores a finished comparison's <c>sr.dcm</c> and <c>seg-&lt;visit&gt;.dcm</c> on the service's DICOMweb server
/// (STOW-RS, <see cref="DicomWebClient"/>) when the submission asked for it (<c>options.storeResults</c>). The outcome
/// is written beside the results as <c>dicomweb-store.json</c> (<c>{"state","stored","server"}</c> or
/// <c>{"state":"failed","error"}</c>); a failure is retried by Hangfire like a callback.
/// </summary>
public sealed class ResultStoreJob(ServiceOptions options, DataPaths paths, ILogger<ResultStoreJob> log)
{
    /// <summary>Name of the outcome file in the comparison's result folder.</summary>
    public const string OutcomeFile = "dicomweb-store.json";

    /// <summary>Stores the DICOM results of comparison <paramref name="comparisonId"/>.</summary>
    [AutomaticRetry(Attempts = 5, DelaysInSeconds = [5, 30, 120, 600, 1800], OnAttemptsExceeded = AttemptsExceededAction.Fail)]
    public void Store(string comparisonId)
    {
        var dir = Path.Combine(paths.Comparisons, comparisonId);
        if (options.DicomWebServer is null || !Directory.Exists(dir)) return;
        var files = Directory.GetFiles(dir, "*.dcm").Order(StringComparer.Ordinal).ToList();
        var server = new Uri(options.DicomWebServer).GetLeftPart(UriPartial.Path);
        try
        {
            using var client = new DicomWebClient(DicomWebOptions.Create(options.DicomWebServer, options.DicomWebAuthorization));
            var result = client.StoreAsync(files).GetAwaiter().GetResult();
            Write(dir, new JsonObject { ["state"] = "stored", ["stored"] = result.Stored, ["server"] = server });
            log.LogInformation("comparison {ComparisonId}: {Count} DICOM results stored on the DICOMweb server", comparisonId, result.Stored);
        }
        catch (InputException e)
        {
            // The message names the server, status and reason; it carries no patient data (UIDs and status codes only).
            Write(dir, new JsonObject { ["state"] = "failed", ["error"] = e.Describe(), ["server"] = server });
            log.LogWarning("comparison {ComparisonId}: storing DICOM results failed ({Kind}); will retry", comparisonId, e.Kind);
            throw;
        }
    }

    private static void Write(string dir, JsonObject outcome)
    {
        var tmp = Path.Combine(dir, OutcomeFile + ".tmp");
        File.WriteAllText(tmp, outcome.ToJsonString());
        File.Move(tmp, Path.Combine(dir, OutcomeFile), overwrite: true);
    }
}
