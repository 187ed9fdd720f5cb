using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using Serimetry.Engine;

namespace Serimetry.Api.Endpoints;

/// <summary><c>/v1/patients/{id}/timeline</c>: the comparisons of one patient (the id is never logged; request logging is off).</summary>
internal static class PatientEndpoints
{
    public static void Map(IEndpointRouteBuilder app)
    {
        var g = app.MapGroup("/v1/patients");
        g.MapGet("/{id}/timeline", Timeline).WithName("getPatientTimeline");
    }

    private static IResult Timeline(string id, HttpContext ctx, MetadataStore store, DataPaths paths)
    {
        var list = store.ComparisonsOfPatient(id);
        store.Audit(ctx.KeyName(), "fetch-timeline", $"{list.Count} comparisons");
        return Results.Json(new JsonObject
        {
            ["comparisons"] = new JsonArray(list.Select(c => (JsonNode)ComparisonEndpoints.Describe(c, paths)).ToArray()),
            ["caution"] = SoftwareInfo.Caution,
        });
    }
}
