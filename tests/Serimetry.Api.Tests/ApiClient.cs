using System.Net;
using System.Net.Http.Headers;
using System.Text;
using System.Text.Json.Nodes;

namespace Serimetry.Api.Tests;

/// <summary>A small HTTP client of the service for the tests.</summary>
internal sealed class ApiClient(string baseUrl, string? key) : IDisposable
{
    private readonly HttpClient _http = Make(baseUrl, key);

    private static HttpClient Make(string baseUrl, string? key)
    {
        var h = new HttpClient { BaseAddress = new Uri(baseUrl), Timeout = TimeSpan.FromMinutes(2) };
        if (key is not null) h.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", key);
        return h;
    }

    public Task<HttpResponseMessage> Send(HttpMethod method, string path, HttpContent? content = null) =>
        _http.SendAsync(new HttpRequestMessage(method, path) { Content = content });

    public static HttpContent Bytes(byte[] data, string mediaType)
    {
        var c = new ByteArrayContent(data);
        c.Headers.ContentType = MediaTypeHeaderValue.Parse(mediaType);
        return c;
    }

    public static HttpContent Json(JsonNode body) => new StringContent(body.ToJsonString(), Encoding.UTF8, "application/json");

    public async Task<JsonObject> Expect(HttpStatusCode status, HttpMethod method, string path, HttpContent? content = null)
    {
        using var r = await Send(method, path, content);
        string text = await r.Content.ReadAsStringAsync();
        Assert.True(r.StatusCode == status, $"{method} {path}: expected {(int)status}, got {(int)r.StatusCode}: {text}");
        return JsonNode.Parse(text)!.AsObject();
    }

    /// <summary>Polls a comparison until it is done or failed.</summary>
    public async Task<JsonObject> WaitFinished(string id, Func<JsonObject, bool>? stopEarly = null)
    {
        for (int i = 0; i < 3000; i++)
        {
            var s = await Expect(HttpStatusCode.OK, HttpMethod.Get, $"/v1/comparisons/{id}");
            if ((string?)s["state"] is "done" or "failed" || (stopEarly?.Invoke(s) ?? false)) return s;
            await Task.Delay(50);
        }
        throw new TimeoutException($"comparison {id} did not finish");
    }

    public void Dispose() => _http.Dispose();
}
