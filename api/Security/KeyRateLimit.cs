using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.RateLimiting;
using Serimetry.Api.Hosting;

namespace Serimetry.Api.Security;

/// <summary>
/// Per-key request limit: a fixed one-minute window per API key (ASP.NET Core rate limiting); above it the
/// service answers 429 (RFC 6585 §4) with problem details and <c>Retry-After</c>. 0 turns the limit off.
/// </summary>
internal static class KeyRateLimit
{
    public static void Add(IServiceCollection services, int requestsPerMinute)
    {
        services.AddRateLimiter(o =>
        {
            o.GlobalLimiter = PartitionedRateLimiter.Create<HttpContext, string>(ctx =>
                requestsPerMinute <= 0 || ctx.Request.Path.StartsWithSegments("/health")
                    ? RateLimitPartition.GetNoLimiter("open")
                    : RateLimitPartition.GetFixedWindowLimiter(ctx.KeyName(), _ => new FixedWindowRateLimiterOptions
                    {
                        PermitLimit = requestsPerMinute, Window = TimeSpan.FromMinutes(1), QueueLimit = 0,
                    }));
            o.OnRejected = async (c, _) =>
            {
                c.HttpContext.Response.Headers.RetryAfter = "60";
                await Problems.Write(c.HttpContext, StatusCodes.Status429TooManyRequests, "rate-limited", "Too many requests",
                    $"this key may send {requestsPerMinute} requests per minute (Serimetry:RequestsPerMinute)");
            };
        });
    }
}
