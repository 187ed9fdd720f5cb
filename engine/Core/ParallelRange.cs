namespace Serimetry.Engine.Core;

/// <summary>
/// The one parallel iteration helper: splits [0, count) into fixed contiguous partitions whose
/// boundaries depend only on <c>count</c> and <c>partitions</c>, so per-partition accumulators merged in
/// partition order give the same result with any thread count.
/// </summary>
public static class ParallelRange
{
    /// <summary>Number of partitions to use for <paramref name="count"/> items of at least <paramref name="minChunk"/> each.</summary>
    public static int PartitionCount(long count, int minChunk, int maxPartitions = 64)
    {
        if (count <= 0) return 0;
        long p = Math.Max(1, count / Math.Max(1, minChunk));
        return (int)Math.Min(p, maxPartitions);
    }

    /// <summary>Start of partition <paramref name="p"/> of <paramref name="partitions"/> over [0, count).</summary>
    public static int PartitionStart(int count, int partitions, int p) => (int)((long)count * p / partitions);

    /// <summary>Runs <paramref name="body"/>(partition, start, end) over fixed partitions, in parallel when <paramref name="maxDegree"/> &gt; 1.</summary>
    public static void For(int count, int minChunk, Action<int, int, int> body, int maxDegree = -1)
    {
        int partitions = PartitionCount(count, minChunk);
        if (partitions == 0) return;
        if (partitions == 1 || maxDegree == 1)
        {
            for (int p = 0; p < partitions; p++)
                body(p, PartitionStart(count, partitions, p), PartitionStart(count, partitions, p + 1));
            return;
        }
        var options = new ParallelOptions { MaxDegreeOfParallelism = maxDegree };
        Parallel.For(0, partitions, options, p =>
            body(p, PartitionStart(count, partitions, p), PartitionStart(count, partitions, p + 1)));
    }
}
