using System.Text.Json;

namespace Serimetry.Api.Hosting;

/// <summary>JSON conventions of the service: camelCase, case-insensitive reading.</summary>
public static class ServiceJson
{
    /// <summary>The serializer options used for request bodies and stored requests.</summary>
    public static readonly JsonSerializerOptions Options = new(JsonSerializerDefaults.Web);
}
