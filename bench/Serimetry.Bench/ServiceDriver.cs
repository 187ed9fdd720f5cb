using System.Diagnostics;
using System.IO.Compression;
using System.Net;
using System.Net.Http.Headers;
using System.Text;
using System.Text.Json.Nodes;
using Serimetry.Engine.Phantoms;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// The integrator's side for the service benchmarks: a two-visit phantom (the API tests' size, 100x80x14 T2w), uploads,
/// comparison submissions and polling over loopback against real <c>serimetry serve</c> processes.
/// </summary>
internal sealed class ServiceDriver : IDisposable
{
    private readonly HttpClient _http;
    private readonly string _phantom;
    private string? _body;

    public ServiceDriver(string key, int connections = 64)
    {
        _http = new HttpClient(new SocketsHttpHandler { MaxConnectionsPerServer = connections }) { Timeout = TimeSpan.FromMinutes(2) };
        _http.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", key);
        _phantom = Directory.CreateTempSubdirectory("serimetry-bench-phantom-").FullName;
        var spec = new PhantomSpec() with
        {
            SubjectId = "NSC-0042", Visits = 2, Seed = 11,
            T2Grid = new PhantomGrid(100, 80, 14, 1.0, 1.0, 3.0), DwiGrid = new PhantomGrid(50, 40, 14, 2.0, 2.0, 3.0),
        };
        PhantomWriter.WriteNifti(_phantom, PhantomGenerator.Generate(spec));
    }

    public HttpClient Http => _http;

    /// <summary>Uploads both visits and the baseline outlines through <paramref name="node"/>; the submission body is kept for <see cref="Submit"/>.</summary>
    public async Task Upload(string node)
    {
        async Task<JsonNode> Post(string path, byte[] data, string type)
        {
            var content = new ByteArrayContent(data);
            content.Headers.ContentType = MediaTypeHeaderValue.Parse(type);
            using var r = await _http.PostAsync(node + path, content);
            string text = await r.Content.ReadAsStringAsync();
            if (r.StatusCode != HttpStatusCode.Created) throw new InvalidOperationException($"POST {path}: {(int)r.StatusCode} {text}");
            return JsonNode.Parse(text)!;
        }
        byte[] Zip(int k)
        {
            string zip = Path.Combine(_phantom, $"visit-{k}.zip");
            if (!File.Exists(zip)) ZipFile.CreateFromDirectory(Path.Combine(_phantom, $"visit-{k}"), zip);
            return File.ReadAllBytes(zip);
        }
        string b = (string)(await Post("/v1/studies", Zip(0), "application/zip"))["studyId"]!;
        string f = (string)(await Post("/v1/studies", Zip(1), "application/zip"))["studyId"]!;
        string Mask(string name) => Path.Combine(_phantom, "visit-0", "masks", name + ".nii.gz");
        string g = (string)(await Post($"/v1/masks?studyId={b}", File.ReadAllBytes(Mask("gland")), "application/octet-stream"))["maskId"]!;
        string l = (string)(await Post($"/v1/masks?studyId={b}", File.ReadAllBytes(Mask("lesion")), "application/octet-stream"))["maskId"]!;
        _body = new JsonObject
        {
            ["baselineStudyId"] = b, ["followupStudyIds"] = new JsonArray(f), ["glandMaskId"] = g, ["lesionMaskId"] = l,
        }.ToJsonString();
    }

    /// <summary>Submits one comparison of the uploaded phantom and returns its id.</summary>
    public async Task<string> Submit(string node)
    {
        using var r = await _http.PostAsync(node + "/v1/comparisons", new StringContent(_body!, Encoding.UTF8, "application/json"));
        string text = await r.Content.ReadAsStringAsync();
        if (r.StatusCode != HttpStatusCode.Accepted) throw new InvalidOperationException($"POST /v1/comparisons: {(int)r.StatusCode} {text}");
        return (string)JsonNode.Parse(text)!["comparisonId"]!;
    }

    /// <summary>The state of a comparison (queued, running, done, failed).</summary>
    public async Task<string> State(string node, string id)
    {
        using var r = await _http.GetAsync($"{node}/v1/comparisons/{id}");
        r.EnsureSuccessStatusCode();
        return (string)JsonNode.Parse(await r.Content.ReadAsStringAsync())!["state"]!;
    }

    /// <summary>Waits until every comparison ended; throws when one failed.</summary>
    public async Task WaitAll(string node, IEnumerable<string> ids)
    {
        foreach (var id in ids)
            while (true)
            {
                string s = await State(node, id);
                if (s == "failed") throw new InvalidOperationException($"comparison {id} failed");
                if (s == "done") break;
                await Task.Delay(200);
            }
    }

    /// <summary>Starts <paramref name="count"/> nodes on one data folder with <paramref name="options"/> and <paramref name="environment"/>.</summary>
    public static async Task<ServiceProcess[]> StartNodes(int count, string data, string[] options, IReadOnlyDictionary<string, string>? environment = null) =>
        await Task.WhenAll(Enumerable.Range(0, count).Select(_ => ServiceProcess.Start(data, options, environment)));

    public static string Seconds(TimeSpan t) => t.TotalSeconds.ToString("0.0", System.Globalization.CultureInfo.InvariantCulture);

    public static Stopwatch Clock() => Stopwatch.StartNew();

    public void Dispose()
    {
        _http.Dispose();
        try { Directory.Delete(_phantom, recursive: true); }
        catch (IOException) { } // the OS temp cleaner removes it later
    }
}
