using System.IO.Compression;
using System.Net;

namespace Serimetry.Api.Tests;

/// <summary>Authentication, request size limit and hostile archives against a real service process.</summary>
public sealed class SecurityTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    private static byte[] Zip(string entryName, int zeroBytes)
    {
        using var ms = new MemoryStream();
        using (var z = new ZipArchive(ms, ZipArchiveMode.Create, leaveOpen: true))
        {
            using var s = z.CreateEntry(entryName, CompressionLevel.SmallestSize).Open();
            s.Write(new byte[zeroBytes]);
        }
        return ms.ToArray();
    }

    [Fact]
    public async Task Keys_size_limit_zip_bomb_and_path_traversal_are_enforced_with_problem_details()
    {
        string data = _data;
        string key = ServiceProcess.CreateKey(data, "security");
        Assert.StartsWith("smk_", key);
        using var service = await ServiceProcess.Start(data, "--max-request-bytes", "1000000", "--rate-limit", "30");
        using var anonymous = new ApiClient(service.BaseUrl, null);
        using var wrong = new ApiClient(service.BaseUrl, key[..^4] + "AAAA");
        using var api = new ApiClient(service.BaseUrl, key);

        // Src: RFC 6750 §3.1 (missing or invalid bearer token → 401 with WWW-Authenticate) and RFC 9457 problem details.
        Assert.Equal(HttpStatusCode.OK, (await anonymous.Send(HttpMethod.Get, "/health")).StatusCode);
        var missing = await anonymous.Expect(HttpStatusCode.Unauthorized, HttpMethod.Get, "/v1/comparisons/x");
        Assert.Equal("urn:serimetry:problem:unauthorized", (string?)missing["type"]);
        await wrong.Expect(HttpStatusCode.Unauthorized, HttpMethod.Get, "/openapi.json");
        using (var r = await anonymous.Send(HttpMethod.Get, "/v1/studies/x"))
            Assert.Equal("application/problem+json", r.Content.Headers.ContentType?.MediaType);
        await api.Expect(HttpStatusCode.NotFound, HttpMethod.Get, "/v1/comparisons/nope");
        using (var spec = await api.Send(HttpMethod.Get, "/openapi.json"))
            Assert.Contains("/v1/comparisons/{id}", await spec.Content.ReadAsStringAsync());

        // Malformed JSON and unknown ids: 400 problem details, nothing queued (Src: RFC 9110 §15.5.1, RFC 9457).
        var malformed = await api.Expect(HttpStatusCode.BadRequest, HttpMethod.Post, "/v1/comparisons",
            new StringContent("{\"baselineStudyId\": ", System.Text.Encoding.UTF8, "application/json"));
        Assert.Equal("urn:serimetry:problem:bad-request", (string?)malformed["type"]);
        var unknown = await api.Expect(HttpStatusCode.BadRequest, HttpMethod.Post, "/v1/comparisons",
            new StringContent("{\"baselineStudyId\":\"nope\",\"followupStudyIds\":[\"nope2\"]}", System.Text.Encoding.UTF8, "application/json"));
        Assert.Contains("nope", (string?)unknown["detail"]);
        var badPreset = await api.Expect(HttpStatusCode.BadRequest, HttpMethod.Post, "/v1/comparisons",
            new StringContent("{\"baselineStudyId\":\"a\",\"followupStudyIds\":[\"b\"],\"options\":{\"followupPreset\":\"warp\"}}",
                System.Text.Encoding.UTF8, "application/json"));
        Assert.Contains("followupPreset", (string?)badPreset["detail"]);
        var notNifti = await api.Expect(HttpStatusCode.NotFound, HttpMethod.Post, "/v1/masks?studyId=nope", ApiClient.Bytes([1, 2, 3], "application/octet-stream"));
        Assert.Equal("urn:serimetry:problem:not-found", (string?)notNifti["type"]);

        // Src: RFC 9110 §15.5.14 (413 Content Too Large) for a body above the configured limit.
        var big = await api.Expect(HttpStatusCode.RequestEntityTooLarge, HttpMethod.Post, "/v1/studies",
            ApiClient.Bytes(new byte[2_000_000], "application/zip"));
        Assert.Equal("urn:serimetry:problem:too-large", (string?)big["type"]);

        // Src: CWE-22 (path traversal): an entry climbing out of the archive is refused before anything is written.
        var traversal = await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, "/v1/studies",
            ApiClient.Bytes(Zip("../../evil.dcm", 100), "application/zip"));
        Assert.Equal("urn:serimetry:problem:input-format", (string?)traversal["type"]);
        Assert.Contains("path traversal", (string?)traversal["detail"]);
        Assert.False(File.Exists(Path.Combine(data, "..", "evil.dcm")));

        // Zip bomb: 40 MB of zeros deflate to ~40 kB, a ratio far above ZipLimits' 100 (common practice: ratio guard).
        var bomb = await api.Expect(HttpStatusCode.RequestEntityTooLarge, HttpMethod.Post, "/v1/studies",
            ApiClient.Bytes(Zip("slice.dcm", 40_000_000), "application/zip"));
        Assert.Equal("urn:serimetry:problem:input-limit", (string?)bomb["type"]);

        // Per-key limit of 30 requests/minute: within 31 more requests one must be refused with 429 (Src: RFC 6585 §4),
        // while /health and other keys stay served.
        HttpStatusCode last = HttpStatusCode.OK;
        for (int i = 0; i < 31 && last != HttpStatusCode.TooManyRequests; i++)
            last = (await api.Send(HttpMethod.Get, "/v1/comparisons/x")).StatusCode;
        Assert.Equal(HttpStatusCode.TooManyRequests, last);
        var limited = await api.Expect(HttpStatusCode.TooManyRequests, HttpMethod.Get, "/v1/comparisons/x");
        Assert.Equal("urn:serimetry:problem:rate-limited", (string?)limited["type"]);
        Assert.Equal(HttpStatusCode.OK, (await anonymous.Send(HttpMethod.Get, "/health")).StatusCode);

        // Keys are stored hashed: the secret part appears in no file of the data folder (database and its WAL).
        service.Kill();
        string secret = key["smk_".Length..].Split('_', 2)[1];
        foreach (var f in Directory.GetFiles(data, "serimetry.db*"))
            Assert.DoesNotContain(secret, System.Text.Encoding.Latin1.GetString(File.ReadAllBytes(f)));
    }
}
