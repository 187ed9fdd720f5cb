using System.Net;
using System.Text.Json.Nodes;

namespace Serimetry.Api.Tests;

/// <summary>The integrator's workflow: upload both phantom exams and the baseline outlines, submit a comparison.</summary>
internal static class Workflow
{
    /// <summary>Study and mask ids of the uploaded phantom (both visits, baseline gland and lesion outlines).</summary>
    public sealed record PhantomIds(string Baseline, string Followup, string Gland, string Lesion);

    public static async Task<string> SubmitPhantomComparison(ApiClient api, string? callbackUrl = null, JsonObject? options = null) =>
        await Submit(api, await UploadPhantom(api), callbackUrl, options);

    /// <summary>Uploads both phantom visits and the baseline outlines (idempotent: the same ids every time).</summary>
    public static async Task<PhantomIds> UploadPhantom(ApiClient api)
    {
        var baseline = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(PhantomStudies.VisitZip(0), "application/zip"));
        var followup = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(PhantomStudies.VisitZip(1), "application/zip"));
        string b = (string)baseline["studyId"]!, f = (string)followup["studyId"]!;
        var gland = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={b}",
            ApiClient.Bytes(PhantomStudies.BaselineMask("gland"), "application/octet-stream"));
        var lesion = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={b}",
            ApiClient.Bytes(PhantomStudies.BaselineMask("lesion"), "application/octet-stream"));
        return new PhantomIds(b, f, (string)gland["maskId"]!, (string)lesion["maskId"]!);
    }

    /// <summary>Submits a comparison of the uploaded phantom (202 + Location checked) and returns its id.</summary>
    public static async Task<string> Submit(ApiClient api, PhantomIds ids, string? callbackUrl = null, JsonObject? options = null)
    {
        var body = new JsonObject
        {
            ["baselineStudyId"] = ids.Baseline, ["followupStudyIds"] = new JsonArray(ids.Followup),
            ["glandMaskId"] = ids.Gland, ["lesionMaskId"] = ids.Lesion,
            ["psa"] = new JsonArray(PhantomStudies.Psa.Select(p => (JsonNode)new JsonObject
            {
                ["date"] = p.Date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture), ["value"] = p.NgPerMl,
            }).ToArray()),
        };
        if (callbackUrl is not null) body["callbackUrl"] = callbackUrl;
        if (options is not null) body["options"] = options;
        using var r = await api.Send(HttpMethod.Post, "/v1/comparisons", ApiClient.Json(body));
        Assert.Equal(HttpStatusCode.Accepted, r.StatusCode);
        var created = JsonNode.Parse(await r.Content.ReadAsStringAsync())!;
        string id = (string)created["comparisonId"]!;
        Assert.Equal($"/v1/comparisons/{id}", r.Headers.Location?.OriginalString);
        return id;
    }

    /// <summary>A fresh temporary folder; the test deletes it with <see cref="DeleteQuietly"/>.</summary>
    public static string TempDir()
    {
        string d = Path.Combine(Path.GetTempPath(), "serimetry-api-test-" + Guid.NewGuid().ToString("N")[..8]);
        Directory.CreateDirectory(d);
        return d;
    }

    public static void DeleteQuietly(string dir)
    {
        try { Directory.Delete(dir, recursive: true); }
        catch (IOException) { }
        catch (UnauthorizedAccessException) { }
    }
}
