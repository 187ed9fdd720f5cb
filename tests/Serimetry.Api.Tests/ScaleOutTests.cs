using System.Net;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;

namespace Serimetry.Api.Tests;

/// <summary>
/// Scale-out: several <c>serimetry serve</c> nodes share one PostgreSQL database (metadata and Hangfire's queue) and one
/// data folder. Exactly-once is counted three ways: the service's attempt counter, each node's log, and Hangfire's own
/// job history in the database (its Processing and Succeeded states).
/// </summary>
[Collection("postgres")]
public sealed class ScaleOutTests(PostgresFixture postgres) : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    private static string[] StoreArgs(string connection) => ["--store", "postgres", "--connection", connection];

    /// <summary>Per comparison id: how many times Hangfire moved its job to Processing and to Succeeded (Src: Hangfire's state history).</summary>
    private Dictionary<string, (int Processing, int Succeeded)> HangfireHistory(string database)
    {
        string rows = postgres.Cluster.Sql(database, """
            SELECT j.arguments::text, count(*) FILTER (WHERE s.name = 'Processing'), count(*) FILTER (WHERE s.name = 'Succeeded')
            FROM hangfire.job j JOIN hangfire.state s ON s.jobid = j.id
            WHERE j.invocationdata::text LIKE '%ComparisonJob%' GROUP BY j.id
            """);
        var result = new Dictionary<string, (int, int)>();
        foreach (var line in rows.Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            var cells = line.Split('|');
            result[Regex.Match(cells[0], "[0-9a-f]{32}").Value] = (int.Parse(cells[1]), int.Parse(cells[2]));
        }
        return result;
    }

    /// <summary>
    /// Hangfire's history once every job in <paramref name="ids"/> reached Succeeded (Hangfire records it just after the
    /// job method returns, so a moment after the service reports done); bounded wait.
    /// </summary>
    private async Task<Dictionary<string, (int Processing, int Succeeded)>> SettledHistory(string database, IReadOnlyCollection<string> ids)
    {
        for (int i = 0; ; i++)
        {
            var h = HangfireHistory(database);
            if (ids.All(id => h.TryGetValue(id, out var c) && c.Succeeded > 0) || i == 100) return h;
            await Task.Delay(200);
        }
    }

    private static int Count(string log, string text) => Regex.Matches(log, Regex.Escape(text)).Count;

    [Fact]
    public async Task Two_nodes_on_one_database_run_a_batch_each_comparison_exactly_once()
    {
        var (connection, database) = postgres.NewDatabase();
        string key = ServiceProcess.CreateKey(_data, "scale-out", StoreArgs(connection));
        // Both nodes start together (concurrent schema creation), one worker each.
        string[] opts = [.. StoreArgs(connection), "--workers", "1", "--rate-limit", "0"];
        var starting = new[] { ServiceProcess.Start(_data, opts), ServiceProcess.Start(_data, opts) };
        using var a = await starting[0];
        using var b = await starting[1];
        using var apiA = new ApiClient(a.BaseUrl, key);
        using var apiB = new ApiClient(b.BaseUrl, key);

        // Uploads through either node land in the same store: the same ids (content addressing over the shared folder).
        var ids = await Workflow.UploadPhantom(apiA);
        Assert.Equal(ids, await Workflow.UploadPhantom(apiB));
        var fast = new JsonObject { ["radiomics"] = false, ["withinExam"] = false };
        var submitted = new List<string>();
        for (int i = 0; i < 6; i++) submitted.Add(await Workflow.Submit(i % 2 == 0 ? apiA : apiB, ids, options: (JsonObject)fast.DeepClone()));

        var results = new List<JsonObject>();
        foreach (var (id, i) in submitted.Select((id, i) => (id, i))) results.Add(await (i % 2 == 0 ? apiB : apiA).WaitFinished(id));
        var history = await SettledHistory(database, submitted);
        a.Kill();
        b.Kill();

        foreach (var (id, status) in submitted.Zip(results))
        {
            Assert.Equal("done", (string?)status["state"]);
            Assert.Equal(1, (int)status["attempts"]!);
            Assert.Equal((1, 1), history[id]);
            // One node logged the start and the end, the other node nothing.
            Assert.Equal(1, Count(a.Log, $"comparison {id} started") + Count(b.Log, $"comparison {id} started"));
            Assert.Equal(1, Count(a.Log, $"comparison {id} done") + Count(b.Log, $"comparison {id} done"));
            // Same inputs, same result (the engine is deterministic): nothing lost or mixed between nodes.
            Assert.True(JsonNode.DeepEquals(results[0]["result"], status["result"]));
        }
        // Both nodes worked on the batch.
        Assert.Contains("started (attempt 1)", a.Log);
        Assert.Contains("started (attempt 1)", b.Log);
        Assert.Equal(6, Directory.GetDirectories(Path.Combine(_data, "comparisons")).Length);
        Assert.Empty(Directory.GetFileSystemEntries(Path.Combine(_data, "incoming")));
        Assert.False(File.Exists(Path.Combine(_data, "serimetry.db")), "the postgres store must not fall back to SQLite");
    }

    [Fact]
    public async Task Node_killed_mid_job_its_comparison_is_finished_by_the_other_node_once()
    {
        var (connection, database) = postgres.NewDatabase();
        string key = ServiceProcess.CreateKey(_data, "scale-out", StoreArgs(connection));
        // A short sliding timeout, so the surviving node takes the orphaned job over within seconds.
        string[] opts = [.. StoreArgs(connection), "--workers", "1", "--job-timeout", "4"];
        var nodes = new[] { await ServiceProcess.Start(_data, opts), await ServiceProcess.Start(_data, opts) };
        try
        {
            using var api = new ApiClient(nodes[0].BaseUrl, key);
            string id = await Workflow.SubmitPhantomComparison(api);
            // Kill the node running it while the follow-up is aligned or the lesion re-fitted (0 < percent < 85).
            await api.WaitFinished(id, s => (string?)s["state"] == "running" && (double)s["progress"]!["percent"]! is > 0 and < 85);
            var runner = nodes.Single(n => n.Log.Contains($"comparison {id} started"));
            var survivor = nodes.Single(n => n != runner);
            runner.Kill();
            Assert.False(File.Exists(Path.Combine(_data, "comparisons", id, "change.json")));

            using var api2 = new ApiClient(survivor.BaseUrl, key);
            var done = await api2.WaitFinished(id);
            Assert.Equal("done", (string?)done["state"]);
            Assert.Equal(2, (int)done["attempts"]!);
            Assert.Contains($"comparison {id} started (attempt 2)", survivor.Log);
            Assert.Contains($"comparison {id} done", survivor.Log);
            // Hangfire's history: processed twice (killed run, take-over), succeeded once.
            Assert.Equal((2, 1), (await SettledHistory(database, [id]))[id]);
            Assert.Single(Directory.GetDirectories(Path.Combine(_data, "comparisons")));
            Assert.Empty(Directory.GetDirectories(Path.Combine(_data, "incoming"), $"cmp-{id}-*"));
            // Complete: the result equals the engine's own run on the same inputs (Src: ComparePipeline directly).
            Assert.True(JsonNode.DeepEquals(JsonNode.Parse(PhantomStudies.ReferenceChangeJson), done["result"]));
            Assert.Equal(HttpStatusCode.OK, (await api2.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/report.html")).StatusCode);
        }
        finally
        {
            foreach (var n in nodes) n.Dispose();
        }
    }
}
