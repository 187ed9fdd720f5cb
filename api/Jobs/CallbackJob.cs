using System.Net.Http.Json;
using System.Text.Json;
using Hangfire;
using Serimetry.Api.Hosting;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Jobs;

/// <summary>
/// Completion callback (webhook): POSTs <c>{"comparisonId","state","location"}</c> — ids only, no patient data — to the
/// submission's <c>callbackUrl</c>. A non-2xx answer or a network error fails the job and Hangfire retries it after
/// 1, 5, 30, 120 and 600 s; the delivery is durable like the comparison itself.
/// </summary>
public sealed class CallbackJob(MetadataStore store, ILogger<CallbackJob> log)
{
    private static readonly HttpClient Http = new() { Timeout = TimeSpan.FromSeconds(30) };

    /// <summary>Delivers the callback of comparison <paramref name="comparisonId"/>.</summary>
    [AutomaticRetry(Attempts = 5, DelaysInSeconds = [1, 5, 30, 120, 600], OnAttemptsExceeded = AttemptsExceededAction.Fail)]
    public void Notify(string comparisonId)
    {
        var c = store.FindComparison(comparisonId);
        if (c is null) return;
        var url = JsonSerializer.Deserialize<ComparisonSubmission>(c.RequestJson, ServiceJson.Options)!.CallbackUrl;
        if (url is null) return;
        using var r = Http.PostAsJsonAsync(url, new { comparisonId, state = c.State, location = $"/v1/comparisons/{comparisonId}" }).GetAwaiter().GetResult();
        if (!r.IsSuccessStatusCode)
        {
            log.LogWarning("callback of comparison {ComparisonId} answered {Status}; will retry", comparisonId, (int)r.StatusCode);
            throw new HttpRequestException($"callback answered {(int)r.StatusCode}");
        }
        log.LogInformation("callback of comparison {ComparisonId} delivered", comparisonId);
    }
}
