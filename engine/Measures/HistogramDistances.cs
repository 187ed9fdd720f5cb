namespace Serimetry.Engine.Measures;

/// <summary>
/// Distances between two empirical distributions (e.g. one lesion's ADC samples at two visits), computed
/// exactly from the sorted samples without binning. Wasserstein-1 (earth mover's distance) is
/// ∫|F_a(x) − F_b(x)| dx, in the samples' unit; the two-sample Kolmogorov–Smirnov statistic is
/// sup_x |F_a(x) − F_b(x)|, unitless in [0, 1]. F are the empirical CDFs (right-continuous step functions).
/// </summary>
public static class HistogramDistances
{
    /// <summary>Wasserstein-1 distance between the empirical distributions of two samples (any order; NaN when one is empty).</summary>
    public static double Wasserstein1(ReadOnlySpan<float> a, ReadOnlySpan<float> b)
    {
        if (a.IsEmpty || b.IsEmpty) return double.NaN;
        float[] x = Sorted(a), y = Sorted(b);
        int i = 0, j = 0;
        double total = 0, previous = Math.Min(x[0], y[0]);
        // Walk the merged support; between consecutive support points both CDFs are constant.
        while (i < x.Length || j < y.Length)
        {
            double next = j >= y.Length || (i < x.Length && x[i] <= y[j]) ? x[i] : y[j];
            total += Math.Abs((double)i / x.Length - (double)j / y.Length) * (next - previous);
            while (i < x.Length && x[i] == next) i++;
            while (j < y.Length && y[j] == next) j++;
            previous = next;
        }
        return total;
    }

    /// <summary>Two-sample Kolmogorov–Smirnov statistic D = sup |F_a − F_b| (NaN when one sample is empty).</summary>
    public static double KolmogorovSmirnov(ReadOnlySpan<float> a, ReadOnlySpan<float> b)
    {
        if (a.IsEmpty || b.IsEmpty) return double.NaN;
        float[] x = Sorted(a), y = Sorted(b);
        int i = 0, j = 0;
        double d = 0;
        while (i < x.Length && j < y.Length)
        {
            double next = Math.Min(x[i], y[j]);
            while (i < x.Length && x[i] == next) i++;
            while (j < y.Length && y[j] == next) j++;
            d = Math.Max(d, Math.Abs((double)i / x.Length - (double)j / y.Length));
        }
        return d;
    }

    private static float[] Sorted(ReadOnlySpan<float> s)
    {
        var copy = s.ToArray();
        foreach (float v in copy)
            if (!float.IsFinite(v)) throw new ArgumentException("samples must be finite; drop NaN/Inf first (NaN policy, docs/measures.md)");
        Array.Sort(copy);
        return copy;
    }
}
