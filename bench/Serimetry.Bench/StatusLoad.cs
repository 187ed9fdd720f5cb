using System.Diagnostics;
using System.Globalization;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// <c>status-load</c>: status polling (<c>GET /v1/comparisons/{id}</c>) under load on one <c>serve</c> node over
/// loopback, a bounded closed loop of C concurrent clients for D seconds each phase, every request the status of one
/// finished comparison (the largest answer: it carries the change vector; each request also writes an audit row).
/// Reference phase: nothing else running. Loaded phase: the same requests while K comparisons run on the node. A 2-second warm-up precedes the phases. Reports requests/s, p50, p99 and max latency of each phase and the ratios loaded / reference.
/// Options: --clients C (16), --seconds D (10), --running K (2), --store sqlite|postgres (sqlite; postgres starts a
/// throwaway cluster).
/// </summary>
internal static class StatusLoad
{
    private sealed record Phase(int Requests, int Errors, double Seconds, double P50Ms, double P99Ms, double MaxMs)
    {
        public double PerSecond => Requests / Seconds;
    }

    public static int Run(string[] args)
    {
        int clients = Option(args, "--clients", 16), seconds = Option(args, "--seconds", 10), running = Option(args, "--running", 2);
        string storeKind = args.SkipWhile(a => a != "--store").Skip(1).FirstOrDefault() ?? "sqlite";
        using var cluster = storeKind == "postgres" ? PostgresCluster.Start() : null;
        string data = Directory.CreateTempSubdirectory("serimetry-bench-load-").FullName;
        try
        {
            string[] store = cluster is null ? [] : ["--store", "postgres", "--connection", cluster.CreateDatabase("bench_load")];
            var (idle, busy) = Measure(data, store, clients, seconds, running).GetAwaiter().GetResult();
            var inv = CultureInfo.InvariantCulture;
            Console.WriteLine(string.Create(inv, $"status polling, {clients} clients, {seconds} s per phase, store {storeKind}, {Environment.ProcessorCount} cores"));
            foreach (var (name, p) in new[] { ("idle (reference)", idle), ($"{running} comparisons running", busy) })
                Console.WriteLine(string.Create(inv,
                    $"{name,-24} {p.PerSecond,8:0} req/s  p50 {p.P50Ms,7:0.0} ms  p99 {p.P99Ms,7:0.0} ms  max {p.MaxMs,7:0.0} ms  errors {p.Errors}"));
            Console.WriteLine(string.Create(inv, $"loaded / reference: throughput {busy.PerSecond / idle.PerSecond:0.00}x, p99 {busy.P99Ms / idle.P99Ms:0.00}x"));
            return busy.Errors + idle.Errors == 0 ? 0 : 1;
        }
        finally
        {
            try { Directory.Delete(data, recursive: true); }
            catch (IOException) { } // the OS temp cleaner removes it later
        }
    }

    private static int Option(string[] args, string name, int fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
    }

    private static async Task<(Phase Idle, Phase Busy)> Measure(string data, string[] store, int clients, int seconds, int running)
    {
        string key = ServiceProcess.CreateKey(data, "bench", store);
        using var node = await ServiceProcess.Start(data, [.. store, "--workers", "1", "--rate-limit", "0"]);
        using var driver = new ServiceDriver(key, clients);
        await driver.Upload(node.BaseUrl);
        string first = await driver.Submit(node.BaseUrl);
        await driver.WaitAll(node.BaseUrl, [first]);
        await Poll(driver, node.BaseUrl, [first], clients, 2); // warm-up (JIT, connection pools), not reported
        var idle = await Poll(driver, node.BaseUrl, [first], clients, seconds);
        var ids = new List<string>();
        for (int i = 0; i < running; i++) ids.Add(await driver.Submit(node.BaseUrl));
        // Poll once the first has started, so the phase measures polling beside running comparisons.
        while (await driver.State(node.BaseUrl, ids[0]) == "queued") await Task.Delay(100);
        var busy = await Poll(driver, node.BaseUrl, [first], clients, seconds);
        Console.WriteLine($"comparison states after the loaded phase: {string.Join(", ", await Task.WhenAll(ids.Select(id => driver.State(node.BaseUrl, id))))}");
        return (idle, busy);
    }

    /// <summary>C clients, each sending its next request when the previous answer arrived, until the phase ends.</summary>
    private static async Task<Phase> Poll(ServiceDriver driver, string node, IReadOnlyList<string> ids, int clients, int seconds)
    {
        var end = Stopwatch.GetTimestamp() + (long)(seconds * Stopwatch.Frequency);
        var start = Stopwatch.GetTimestamp();
        var perClient = await Task.WhenAll(Enumerable.Range(0, clients).Select(c => Task.Run(async () =>
        {
            var latencies = new List<double>(4096);
            int errors = 0;
            for (int i = 0; Stopwatch.GetTimestamp() < end; i++)
            {
                long t0 = Stopwatch.GetTimestamp();
                using var r = await driver.Http.GetAsync($"{node}/v1/comparisons/{ids[(c + i) % ids.Count]}");
                await r.Content.ReadAsByteArrayAsync();
                latencies.Add(Stopwatch.GetElapsedTime(t0).TotalMilliseconds);
                if (!r.IsSuccessStatusCode) errors++;
            }
            return (latencies, errors);
        })));
        double elapsed = Stopwatch.GetElapsedTime(start).TotalSeconds;
        var all = perClient.SelectMany(p => p.latencies).Order().ToArray();
        double Pct(double q) => all[Math.Min(all.Length - 1, (int)Math.Ceiling(q * all.Length) - 1)];
        return new Phase(all.Length, perClient.Sum(p => p.errors), elapsed, Pct(0.50), Pct(0.99), all[^1]);
    }
}
