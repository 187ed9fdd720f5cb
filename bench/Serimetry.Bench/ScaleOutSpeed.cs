using System.Globalization;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// <c>scale-out</c>: the same batch of comparisons (default 6 phantom comparisons with the service defaults) on one
/// <c>serve</c> node and on two nodes sharing one PostgreSQL database and data folder, each node with the same worker
/// count (default 1, so the two-node run has twice the workers — the point of adding a node). Prints wall times and
/// the ratio one node / two nodes. A throwaway PostgreSQL cluster (Debian's postgresql) is started for the run.
/// <c>--node-cores N</c> gives each node N processors (<c>DOTNET_PROCESSOR_COUNT</c>: the engine's parallel loops use
/// N threads), modelling nodes that are separate N-core machines; 0 lets every node use all cores of this machine.
/// <c>--verbose</c> prints each node's start and end lines of every comparison. Each run first warms its nodes up with one comparison per node (not timed). <c>--repeat R</c> alternates the one- and two-node runs R times and reports medians (load on a shared machine drifts).
/// </summary>
internal static class ScaleOutSpeed
{
    public static int Run(string[] args)
    {
        int batch = Option(args, "--batch", 6), workers = Option(args, "--workers", 1);
        int cores = Option(args, "--node-cores", 0), repeat = Option(args, "--repeat", 1);
        bool verbose = args.Contains("--verbose");
        var environment = cores > 0 ? new Dictionary<string, string> { ["DOTNET_PROCESSOR_COUNT"] = cores.ToString(CultureInfo.InvariantCulture) } : null;
        using var cluster = PostgresCluster.Start();
        var inv = CultureInfo.InvariantCulture;
        Console.WriteLine(string.Create(inv,
            $"batch of {batch} comparisons, {workers} worker(s) per node, {(cores > 0 ? $"{cores} core(s) per node" : "all cores per node")}, {Environment.ProcessorCount} cores here"));
        var one = new List<double>();
        var two = new List<double>();
        for (int r = 0; r < repeat; r++)
        {
            one.Add(Batch(cluster, nodes: 1, workers, batch, environment, verbose).GetAwaiter().GetResult().TotalSeconds);
            two.Add(Batch(cluster, nodes: 2, workers, batch, environment, verbose).GetAwaiter().GetResult().TotalSeconds);
            Console.WriteLine(string.Create(inv, $"run {r + 1}: 1 node {one[^1],7:0.0} s, 2 nodes {two[^1],7:0.0} s"));
        }
        double m1 = Median(one), m2 = Median(two);
        Console.WriteLine(string.Create(inv, $"median: 1 node {m1,7:0.0} s, 2 nodes {m2,7:0.0} s; speed-up (1 node / 2 nodes): {m1 / m2:0.00}x"));
        return 0;
    }

    private static double Median(List<double> v)
    {
        var s = v.Order().ToArray();
        return s.Length % 2 == 1 ? s[s.Length / 2] : (s[s.Length / 2 - 1] + s[s.Length / 2]) / 2;
    }

    private static int Option(string[] args, string name, int fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
    }

    /// <summary>Wall time from the first submission to the last comparison done, on a fresh database and data folder.</summary>
    private static async Task<TimeSpan> Batch(PostgresCluster cluster, int nodes, int workers, int batch, IReadOnlyDictionary<string, string>? environment, bool verbose)
    {
        string connection = cluster.CreateDatabase($"bench_{nodes}_{Guid.NewGuid():N}"[..30]);
        string data = Directory.CreateTempSubdirectory("serimetry-bench-scale-").FullName;
        string[] store = ["--store", "postgres", "--connection", connection];
        try
        {
            string key = ServiceProcess.CreateKey(data, "bench", store);
            var started = await ServiceDriver.StartNodes(nodes, data, [.. store, "--workers", workers.ToString(CultureInfo.InvariantCulture), "--rate-limit", "0"], environment);
            try
            {
                using var driver = new ServiceDriver(key);
                await driver.Upload(started[0].BaseUrl);
                // Warm-up: one comparison per node first (a fresh process compiles the pipeline on its first run), so the
                // timed batch measures steady throughput.
                var warm = new List<string>();
                for (int i = 0; i < nodes; i++) warm.Add(await driver.Submit(started[i].BaseUrl));
                await driver.WaitAll(started[0].BaseUrl, warm);
                var clock = ServiceDriver.Clock();
                var ids = new List<string>();
                for (int i = 0; i < batch; i++) ids.Add(await driver.Submit(started[i % nodes].BaseUrl));
                await driver.WaitAll(started[0].BaseUrl, ids);
                var elapsed = clock.Elapsed;
                if (verbose)
                    foreach (var (n, i) in started.Select((n, i) => (n, i)))
                        foreach (var line in n.Log.Split('\n').Where(l => l.Contains("comparison ")))
                            Console.WriteLine($"node {i}: {line.Trim()}");
                return elapsed;
            }
            finally
            {
                foreach (var n in started) n.Dispose();
            }
        }
        finally
        {
            try { Directory.Delete(data, recursive: true); }
            catch (IOException) { } // the OS temp cleaner removes it later
        }
    }
}
