using System.Text.Json;
using System.Text.Json.Nodes;
using Hangfire;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Serimetry.Api.Hosting;
using Serimetry.Api.Jobs;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using Serimetry.Engine;

namespace Serimetry.Api.Endpoints;

/// <summary><c>/v1/comparisons</c>: submit (202 + Location), status with the change vector when done, result files.</summary>
internal static class ComparisonEndpoints
{
    public static void Map(IEndpointRouteBuilder app)
    {
        var g = app.MapGroup("/v1/comparisons");
        g.MapPost("/", Create).WithName("createComparison").Accepts<ComparisonSubmission>("application/json");
        g.MapGet("/{id}", Get).WithName("getComparison");
        g.MapGet("/{id}/files/{name}", GetFile).WithName("getComparisonFile");
    }

    private static IResult Create(ComparisonSubmission body, HttpContext ctx, MetadataStore store, IBackgroundJobClient jobs, ServiceOptions options,
        ILogger<ComparisonJob> log)
    {
        var problem = Validate(body, store, options);
        if (problem is not null) return Problems.BadRequest(problem);
        string id = ComparisonQueue.Enqueue(store, jobs, body);
        store.Audit(ctx.KeyName(), "submit-comparison", id);
        log.LogInformation("comparison {ComparisonId} queued for baseline study {StudyId}", id, body.BaselineStudyId);
        return TypedResults.Accepted($"/v1/comparisons/{id}", new { comparisonId = id, state = "queued", caution = SoftwareInfo.Caution });
    }

    private static string? Validate(ComparisonSubmission b, MetadataStore store, ServiceOptions options)
    {
        if (b.Options?.StoreResults == true && options.DicomWebServer is null)
            return "options.storeResults needs a DICOMweb server configured on the service (serve --dicomweb-server URL)";
        if (b.BaselineStudyId is null) return "baselineStudyId is required";
        if (b.FollowupStudyIds is not { Count: > 0 }) return "followupStudyIds needs at least one study id";
        if (b.Options?.FollowupPreset is { } preset && preset is not ("rigid" or "affine"))
            return $"options.followupPreset must be rigid or affine, got '{preset}'";
        foreach (var s in b.FollowupStudyIds.Prepend(b.BaselineStudyId))
            if (store.FindStudy(s) is null) return $"no study with id '{s}' (upload it with POST /v1/studies first)";
        foreach (var m in new[] { b.GlandMaskId, b.LesionMaskId })
            if (m is not null && store.FindMask(m) is null) return $"no mask with id '{m}' (upload it with POST /v1/masks first)";
        if (b.CallbackUrl is not null && !(Uri.TryCreate(b.CallbackUrl, UriKind.Absolute, out var u) && u.Scheme is "http" or "https"))
            return $"callbackUrl must be an absolute http(s) URL, got '{b.CallbackUrl}'";
        foreach (var p in b.Psa ?? [])
            if (!DateOnly.TryParseExact(p.Date, "yyyy-MM-dd", out _) || !double.IsFinite(p.Value) || p.Value < 0)
                return $"psa entries need date yyyy-MM-dd and a value >= 0 ng/mL, got '{p.Date}'={p.Value}";
        return null;
    }

    private static IResult Get(string id, HttpContext ctx, MetadataStore store, DataPaths paths)
    {
        var c = store.FindComparison(id);
        if (c is null) return Problems.NotFound("comparison", id);
        store.Audit(ctx.KeyName(), "fetch-comparison", id);
        return Results.Json(Describe(c, paths));
    }

    internal static JsonObject Describe(ComparisonRecord c, DataPaths paths)
    {
        var o = new JsonObject
        {
            ["comparisonId"] = c.Id, ["state"] = c.State,
            ["progress"] = new JsonObject { ["stage"] = c.Stage, ["percent"] = c.Percent },
            ["attempts"] = c.Runs, ["created"] = c.Created, ["finished"] = c.Finished,
        };
        if (c.State == "done")
        {
            string dir = Path.Combine(paths.Comparisons, c.Id);
            o["result"] = JsonNode.Parse(File.ReadAllText(Path.Combine(dir, "change.json")));
            o["files"] = new JsonArray(Directory.GetFiles(dir).Select(f => Path.GetFileName(f)).Order(StringComparer.Ordinal).Select(f => (JsonNode)f!).ToArray());
        }
        if (c.ProblemJson is not null) o["problem"] = JsonNode.Parse(c.ProblemJson);
        o["caution"] = SoftwareInfo.Caution;
        return o;
    }

    private static IResult GetFile(string id, string name, HttpContext ctx, MetadataStore store, DataPaths paths)
    {
        var c = store.FindComparison(id);
        if (c is null) return Problems.NotFound("comparison", id);
        if (c.State != "done") return Problems.Result(Problems.Document(409, "not-ready", "Result not ready", $"comparison '{id}' is {c.State}"));
        string dir = Path.Combine(paths.Comparisons, id);
        // Only names of files directly in the result folder are served: no separators, no traversal.
        var match = Directory.GetFiles(dir).Select(Path.GetFileName).FirstOrDefault(f => f == name);
        if (match is null) return Problems.NotFound("file", name);
        store.Audit(ctx.KeyName(), "fetch-file", $"{id}/{match}");
        return Results.File(Path.Combine(dir, match), ContentType(match));
    }

    private static string ContentType(string name) => Path.GetExtension(name) switch
    {
        ".json" => "application/json",
        ".csv" => "text/csv",
        ".html" => "text/html",
        ".png" => "image/png",
        _ => "application/octet-stream",
    };
}
