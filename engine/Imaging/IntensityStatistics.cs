using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>Count, extremes, mean and spread of image values inside a mask; NaN voxels are skipped and counted.</summary>
/// <param name="Count">Finite voxel values used.</param>
/// <param name="NaNCount">Voxels inside the mask whose value is NaN (left out of every figure).</param>
/// <param name="Min">Smallest value (NaN when <paramref name="Count"/> is 0).</param>
/// <param name="Max">Largest value (NaN when empty).</param>
/// <param name="Mean">Arithmetic mean (NaN when empty).</param>
/// <param name="Variance">Population variance, divisor N (IBSI 1 "Variance", ECT2; NaN when empty).</param>
public sealed record IntensitySummary(long Count, long NaNCount, double Min, double Max, double Mean, double Variance)
{
    /// <summary>Population standard deviation.</summary>
    public double StandardDeviation => Math.Sqrt(Variance);
}

/// <summary>
/// Summary statistics of a volume's values, optionally restricted to a mask (any non-zero voxel, or one label).
/// Uses Welford's update per fixed partition and Chan et al.'s pairwise merge in partition order, so the
/// result is the same for any thread count and accurate for large, offset values.
/// </summary>
public static class IntensityStatistics
{
    public static IntensitySummary Summarize(Volume<float> image, Volume<byte>? mask = null, byte? label = null)
    {
        ArgumentNullException.ThrowIfNull(image);
        if (mask is not null) image.Geometry.RequireCongruent(mask.Geometry, "image and mask");
        var values = image.Voxels;
        var labels = mask?.Voxels;
        int partitions = ParallelRange.PartitionCount(values.Length, 1 << 16);
        var parts = new Accumulator[Math.Max(1, partitions)];
        ParallelRange.For(values.Length, 1 << 16, (p, start, end) =>
        {
            var acc = Accumulator.Empty;
            for (int i = start; i < end; i++)
            {
                if (labels is not null && (label is byte l ? labels[i] != l : labels[i] == 0)) continue;
                acc.Add(values[i]);
            }
            parts[p] = acc;
        });
        var total = Accumulator.Empty;
        foreach (var part in parts) total = Accumulator.Merge(total, part);
        return total.ToSummary();
    }

    private struct Accumulator
    {
        public long N, NaN;
        public double Mean, M2, Min, Max;

        public static Accumulator Empty => new() { Min = double.PositiveInfinity, Max = double.NegativeInfinity };

        public void Add(double x)
        {
            if (double.IsNaN(x))
            {
                NaN++;
                return;
            }
            N++;
            double d = x - Mean;
            Mean += d / N;
            M2 += d * (x - Mean);
            if (x < Min) Min = x;
            if (x > Max) Max = x;
        }

        /// <summary>Chan, Golub &amp; LeVeque (1979) pairwise combination of two partial results.</summary>
        public static Accumulator Merge(Accumulator a, Accumulator b)
        {
            if (b.N == 0) return a with { NaN = a.NaN + b.NaN };
            if (a.N == 0) return b with { NaN = a.NaN + b.NaN };
            long n = a.N + b.N;
            double d = b.Mean - a.Mean;
            return new Accumulator
            {
                N = n,
                NaN = a.NaN + b.NaN,
                Mean = a.Mean + d * b.N / n,
                M2 = a.M2 + b.M2 + d * d * a.N * b.N / n,
                Min = Math.Min(a.Min, b.Min),
                Max = Math.Max(a.Max, b.Max),
            };
        }

        public readonly IntensitySummary ToSummary() => N == 0
            ? new IntensitySummary(0, NaN, double.NaN, double.NaN, double.NaN, double.NaN)
            : new IntensitySummary(N, NaN, Min, Max, Mean, M2 / N);
    }
}
