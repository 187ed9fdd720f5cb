using System.Text.Json;
using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Diagnostics;
using Microsoft.AspNetCore.Http;
using Serimetry.Engine.Core;

namespace Serimetry.Api.Hosting;

/// <summary>
/// Problem details (RFC 9457) for every error. The <c>type</c> is a stable URN per problem kind
/// (<c>urn:serimetry:problem:&lt;kind&gt;</c>): the engine's <see cref="InputException"/> kinds map to
/// <c>input-format</c>, <c>input-unsupported</c>, <c>input-geometry</c>, <c>input-limit</c>, <c>input-parameter</c>.
/// </summary>
public static class Problems
{
    /// <summary>Media type of problem documents (RFC 9457 §3).</summary>
    public const string MediaType = "application/problem+json";

    /// <summary>The type URN of a problem slug.</summary>
    public static string TypeUri(string slug) => "urn:serimetry:problem:" + slug;

    /// <summary>A problem document as JSON.</summary>
    public static JsonObject Document(int status, string slug, string title, string? detail, string? instance = null)
    {
        var o = new JsonObject { ["type"] = TypeUri(slug), ["title"] = title, ["status"] = status };
        if (detail is not null) o["detail"] = detail;
        if (instance is not null) o["instance"] = instance;
        return o;
    }

    /// <summary>The problem document of an engine input error (status 422: the request was understood but its content is unusable).</summary>
    public static JsonObject FromInput(InputException e, string? instance = null)
    {
        var o = Document(e is InputLimitException ? StatusCodes.Status413PayloadTooLarge : StatusCodes.Status422UnprocessableEntity,
            "input-" + e.Kind, TitleOf(e.Kind), e.Message, instance);
        if (e.Fix is not null) o["fix"] = e.Fix;
        return o;
    }

    private static string TitleOf(string kind) => kind switch
    {
        "format" => "Unreadable input",
        "unsupported" => "Unsupported input",
        "geometry" => "Images do not match geometrically",
        "limit" => "Input exceeds a safety limit",
        _ => "Invalid parameter",
    };

    /// <summary>Writes a problem response.</summary>
    public static Task Write(HttpContext ctx, int status, string slug, string title, string? detail) =>
        Write(ctx, Document(status, slug, title, detail, ctx.Request.Path));

    /// <summary>Writes a problem document with its own status.</summary>
    public static async Task Write(HttpContext ctx, JsonObject doc)
    {
        ctx.Response.StatusCode = (int)doc["status"]!;
        ctx.Response.ContentType = MediaType;
        await ctx.Response.WriteAsync(doc.ToJsonString());
    }

    /// <summary>A typed result carrying a problem document.</summary>
    public static IResult Result(JsonObject doc) =>
        Results.Text(doc.ToJsonString(), MediaType, System.Text.Encoding.UTF8, (int)doc["status"]!);

    /// <summary>404 for an unknown resource.</summary>
    public static IResult NotFound(string what, string id) =>
        Result(Document(StatusCodes.Status404NotFound, "not-found", "Not found", $"no {what} with id '{id}'"));

    /// <summary>400 for a malformed request.</summary>
    public static IResult BadRequest(string detail) =>
        Result(Document(StatusCodes.Status400BadRequest, "bad-request", "Bad request", detail));

    /// <summary>Exception handler: engine input errors, oversized bodies, malformed JSON, everything else as 500 without internals.</summary>
    internal static async Task HandleException(HttpContext ctx)
    {
        var error = ctx.Features.Get<IExceptionHandlerFeature>()?.Error;
        var doc = error switch
        {
            InputException ie => FromInput(ie, ctx.Request.Path),
            BadHttpRequestException { StatusCode: StatusCodes.Status413PayloadTooLarge } =>
                Document(413, "too-large", "Request body too large", "the upload exceeds the configured request size limit (Serimetry:MaxRequestBytes)", ctx.Request.Path),
            BadHttpRequestException b => Document(b.StatusCode, "bad-request", "Bad request", b.Message, ctx.Request.Path),
            JsonException j => Document(400, "bad-request", "Malformed JSON", j.Message, ctx.Request.Path),
            _ => Document(500, "internal", "Internal error", "the service failed; the log has details", ctx.Request.Path),
        };
        if ((int)doc["status"]! == 500 && error is not null)
            // Type and stack only: exception messages may quote header values (patient data).
            ctx.RequestServices.GetRequiredService<ILoggerFactory>().CreateLogger("Serimetry.Api").LogError(
                "unhandled {ErrorType} at {StackTrace}", error.GetType().FullName, error.StackTrace);
        await Write(ctx, doc);
    }
}
