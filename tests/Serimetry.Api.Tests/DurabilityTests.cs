using System.Net;
using System.Text.Json.Nodes;

namespace Serimetry.Api.Tests;

/// <summary>A comparison survives a crash of the serving process (real SIGKILL) and completes once after restart.</summary>
public sealed class DurabilityTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    [Fact]
    public async Task Killed_node_mid_job_then_restart_completes_the_job_exactly_once()
    {
        string data = _data;
        string key = ServiceProcess.CreateKey(data, "durability");
        string id;
        // A short job timeout so the restarted node takes over the orphaned job within seconds.
        string[] opts = ["--job-timeout", "4"];
        using (var first = await ServiceProcess.Start(data, opts))
        {
            using var api = new ApiClient(first.BaseUrl, key);
            id = await Workflow.SubmitPhantomComparison(api);
            // Kill while the follow-up is being aligned or the lesion re-fitted (0 < percent < 85), well before outputs are written.
            var running = await api.WaitFinished(id, s => (string?)s["state"] == "running" && (double)s["progress"]!["percent"]! is > 0 and < 85);
            Assert.Equal("running", (string?)running["state"]);
            first.Kill();
        }
        Assert.False(File.Exists(Path.Combine(data, "comparisons", id, "change.json")));

        using var second = await ServiceProcess.Start(data, opts);
        using var api2 = new ApiClient(second.BaseUrl, key);
        var done = await api2.WaitFinished(id);
        Assert.Equal("done", (string?)done["state"]);
        // Exactly once: two attempts started (the killed one and the resumed one), one result folder.
        Assert.Equal(2, (int)done["attempts"]!);
        Assert.Single(Directory.GetDirectories(Path.Combine(data, "comparisons")));
        Assert.Empty(Directory.GetDirectories(Path.Combine(data, "incoming"), $"cmp-{id}-*"));
        // Complete: the result equals the engine's own run on the same inputs (Src: ComparePipeline directly).
        Assert.True(JsonNode.DeepEquals(JsonNode.Parse(PhantomStudies.ReferenceChangeJson), done["result"]));
        foreach (var f in new[] { "report.html", "measures.csv", "changes.csv" })
            Assert.Equal(HttpStatusCode.OK, (await api2.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/{f}")).StatusCode);
        await Task.Delay(1500);
        var later = await api2.Expect(HttpStatusCode.OK, HttpMethod.Get, $"/v1/comparisons/{id}");
        Assert.Equal(2, (int)later["attempts"]!);
    }
}
