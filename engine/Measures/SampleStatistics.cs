using System.Numerics;

namespace Serimetry.Engine.Measures;

/// <summary>
/// First-order statistics of a sample, written down once for every measure that uses them.
/// Moments follow the IBSI intensity-statistics definitions (Src: IBSI reference manual §3.3,
/// Zwanenburg et al., Radiology 2020): mean (Q4LE), population variance with 1/N (ECT3) and its root as
/// SD, skewness m3/m2^1.5 (KE2A), excess kurtosis m4/m2² − 3 (IPH6). Percentiles use linear interpolation
/// between order statistics, Hyndman &amp; Fan (Am Stat 1996;50:361) definition 7: for sorted x[0..n−1] and
/// p in [0,1], h = (n−1)·p, P = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋]). The median is P(0.5).
/// The radiomics intensity families (engine/Radiomics/Intensity/DistributionStats.cs) use these same definitions
/// through the double overloads; every sum is accumulated in double whatever the sample type.
/// </summary>
public static class SampleStatistics
{
    /// <summary>Arithmetic mean (Kahan-compensated sum in double).</summary>
    public static double Mean(ReadOnlySpan<float> x) => MeanOf(x);

    /// <summary>Arithmetic mean (Kahan-compensated sum).</summary>
    public static double Mean(ReadOnlySpan<double> x) => MeanOf(x);

    /// <summary>Central moments m2, m3, m4 with 1/N normalisation.</summary>
    public static (double M2, double M3, double M4) CentralMoments(ReadOnlySpan<float> x, double mean) => MomentsOf(x, mean);

    /// <summary>Central moments m2, m3, m4 with 1/N normalisation.</summary>
    public static (double M2, double M3, double M4) CentralMoments(ReadOnlySpan<double> x, double mean) => MomentsOf(x, mean);

    private static double MeanOf<T>(ReadOnlySpan<T> x) where T : unmanaged, INumberBase<T>
    {
        if (x.IsEmpty) return double.NaN;
        double s = 0, c = 0;
        foreach (T value in x)
        {
            // Kahan-compensated sum: many similar values make naive float sums drift.
            double y = double.CreateTruncating(value) - c, t = s + y;
            c = (t - s) - y;
            s = t;
        }
        return s / x.Length;
    }

    private static (double M2, double M3, double M4) MomentsOf<T>(ReadOnlySpan<T> x, double mean) where T : unmanaged, INumberBase<T>
    {
        double m2 = 0, m3 = 0, m4 = 0;
        foreach (T value in x)
        {
            double d = double.CreateTruncating(value) - mean, d2 = d * d;
            m2 += d2;
            m3 += d2 * d;
            m4 += d2 * d2;
        }
        int n = x.Length;
        return (m2 / n, m3 / n, m4 / n);
    }

    /// <summary>Population standard deviation √m2 (IBSI ECT3 variance, rooted).</summary>
    public static double PopulationSd(ReadOnlySpan<float> x) => Math.Sqrt(CentralMoments(x, Mean(x)).M2);

    /// <summary>Sample standard deviation with n−1 (used for the shell noise in the CNR).</summary>
    public static double SampleSd(ReadOnlySpan<float> x)
    {
        if (x.Length < 2) return double.NaN;
        return Math.Sqrt(CentralMoments(x, Mean(x)).M2 * x.Length / (x.Length - 1));
    }

    /// <summary>Skewness m3/m2^1.5 (IBSI KE2A); 0 for a constant sample (IBSI convention).</summary>
    public static double Skewness(ReadOnlySpan<float> x)
    {
        var (m2, m3, _) = CentralMoments(x, Mean(x));
        return m2 == 0 ? 0 : m3 / Math.Pow(m2, 1.5);
    }

    /// <summary>Excess kurtosis m4/m2² − 3 (IBSI IPH6); 0 for a constant sample (IBSI convention).</summary>
    public static double ExcessKurtosis(ReadOnlySpan<float> x)
    {
        var (m2, _, m4) = CentralMoments(x, Mean(x));
        return m2 == 0 ? 0 : m4 / (m2 * m2) - 3;
    }

    /// <summary>Percentile p ∈ [0, 1] of an ascending sample (Hyndman &amp; Fan definition 7).</summary>
    public static double Percentile(ReadOnlySpan<float> sorted, double p) => PercentileOf(sorted, p);

    /// <summary>Percentile p ∈ [0, 1] of an ascending sample (Hyndman &amp; Fan definition 7).</summary>
    public static double Percentile(ReadOnlySpan<double> sorted, double p) => PercentileOf(sorted, p);

    private static double PercentileOf<T>(ReadOnlySpan<T> sorted, double p) where T : unmanaged, INumberBase<T>
    {
        if (sorted.IsEmpty) return double.NaN;
        if (p is < 0 or > 1 || double.IsNaN(p)) throw new ArgumentOutOfRangeException(nameof(p), p, "percentile must be in [0, 1]");
        double h = (sorted.Length - 1) * p;
        int lo = (int)Math.Floor(h);
        double low = double.CreateTruncating(sorted[lo]);
        if (lo >= sorted.Length - 1) return low;
        return low + (h - lo) * (double.CreateTruncating(sorted[lo + 1]) - low);
    }
}
