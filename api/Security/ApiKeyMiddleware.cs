using Microsoft.AspNetCore.Http;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Security;

/// <summary>
/// Requires <c>Authorization: Bearer &lt;key&gt;</c> (RFC 6750 §2.1) on every path but <c>/health</c>; answers 401 with
/// problem details and a <c>WWW-Authenticate</c> challenge otherwise. The key's name is kept in
/// <see cref="HttpContext.Items"/> for the audit log.
/// </summary>
internal static class ApiKeyMiddleware
{
    public const string KeyNameItem = "serimetry.key";

    public static async Task Invoke(HttpContext ctx, Func<Task> next)
    {
        if (ctx.Request.Path.StartsWithSegments("/health")) { await next(); return; }
        var store = ctx.RequestServices.GetRequiredService<MetadataStore>();
        string? header = ctx.Request.Headers.Authorization;
        string? key = header is not null && header.StartsWith("Bearer ", StringComparison.OrdinalIgnoreCase) ? header[7..].Trim() : null;
        var name = ApiKeys.Verify(store, key);
        if (name is null)
        {
            ctx.Response.Headers.WWWAuthenticate = "Bearer realm=\"serimetry\"";
            await Hosting.Problems.Write(ctx, StatusCodes.Status401Unauthorized, "unauthorized", "Missing or invalid API key",
                "send 'Authorization: Bearer <key>' with a key from 'serimetry keys create'");
            return;
        }
        ctx.Items[KeyNameItem] = name;
        await next();
    }

    /// <summary>The calling key's name (set by the middleware).</summary>
    public static string KeyName(this HttpContext ctx) => ctx.Items[KeyNameItem] as string ?? "anonymous";
}
