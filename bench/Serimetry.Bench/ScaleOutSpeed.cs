using System.Globalization;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// <c>scale-out</c>: the same batch of comparisons (default 6 phantom comparisons with the service defaults) on one
/// <c>serve</c> node and on two nodes sharing one PostgreSQL database and data folder, each node with the same worker
/// count (default 1, so the two-node run has twice the workers — the point of adding a node). Prints wall times and
/// the ratio one node / two nodes. A throwaway PostgreSQL cluster (Debian's postgresql) is started for the run.
/// </summary>
internal static class ScaleOutSpeed
{
    public static int Run(string[] args)
    {
        int batch = Option(args, "--batch", 6), workers = Option(args, "--workers", 1);
        using var cluster = PostgresCluster.Start();
        var one = Batch(cluster, nodes: 1, workers, batch).GetAwaiter().GetResult();
        var two = Batch(cluster, nodes: 2, workers, batch).GetAwaiter().GetResult();
        var inv = CultureInfo.InvariantCulture;
        Console.WriteLine(string.Create(inv, $"batch of {batch} comparisons, {workers} worker(s) per node, {Environment.ProcessorCount} cores"));
        Console.WriteLine(string.Create(inv, $"1 node : {one.TotalSeconds,7:0.0} s"));
        Console.WriteLine(string.Create(inv, $"2 nodes: {two.TotalSeconds,7:0.0} s"));
        Console.WriteLine(string.Create(inv, $"speed-up (1 node / 2 nodes): {one / two:0.00}x"));
        return 0;
    }

    private static int Option(string[] args, string name, int fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
    }

    /// <summary>Wall time from the first submission to the last comparison done, on a fresh database and data folder.</summary>
    private static async Task<TimeSpan> Batch(PostgresCluster cluster, int nodes, int workers, int batch)
    {
        string connection = cluster.CreateDatabase($"bench_{nodes}_{Guid.NewGuid():N}"[..30]);
        string data = Directory.CreateTempSubdirectory("serimetry-bench-scale-").FullName;
        string[] store = ["--store", "postgres", "--connection", connection];
        try
        {
            string key = ServiceProcess.CreateKey(data, "bench", store);
            var started = await ServiceDriver.StartNodes(nodes, data, [.. store, "--workers", workers.ToString(CultureInfo.InvariantCulture), "--rate-limit", "0"]);
            try
            {
                using var driver = new ServiceDriver(key);
                await driver.Upload(started[0].BaseUrl);
                var clock = ServiceDriver.Clock();
                var ids = new List<string>();
                for (int i = 0; i < batch; i++) ids.Add(await driver.Submit(started[i % nodes].BaseUrl));
                await driver.WaitAll(started[0].BaseUrl, ids);
                return clock.Elapsed;
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
