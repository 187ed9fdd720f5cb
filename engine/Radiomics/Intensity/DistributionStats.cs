using Serimetry.Engine.Measures;

namespace Serimetry.Engine.Radiomics.Intensity;

/// <summary>
/// Statistics of a sample shared by the intensity-based statistics (IBSI 3.3) and intensity histogram
/// (IBSI 3.4) families. Mean, central moments and percentiles come from <see cref="SampleStatistics"/>, the one
/// definition the compare measures use too (population variance; Hyndman &amp; Fan type 7 percentiles, which IBSI
/// leaves open; docs/radiomics.md). This type adds the IBSI-only derived statistics.
/// </summary>
internal readonly record struct DistributionStats(
    double Mean, double Variance, double Skewness, double Kurtosis, double Median, double Min, double P10, double P25,
    double P75, double P90, double Max, double MeanAbsDev, double RobustMeanAbsDev, double MedianAbsDev,
    double CoefficientOfVariation, double QuartileCoefficient, double Energy, double RootMeanSquare)
{
    /// <summary>Computes the statistics of <paramref name="sorted"/> (ascending, non-empty).</summary>
    public static DistributionStats Of(ReadOnlySpan<double> sorted)
    {
        int n = sorted.Length;
        double mean = SampleStatistics.Mean(sorted);
        var (m2, m3, m4) = SampleStatistics.CentralMoments(sorted, mean);
        double energy = 0, mad = 0;
        foreach (var v in sorted) { energy += v * v; mad += Math.Abs(v - mean); }
        // IBSI 3.3.3/3.3.4: skewness and kurtosis are 0 when the variance is 0.
        double skew = m2 > 0 ? m3 / Math.Pow(m2, 1.5) : 0;
        double kurt = m2 > 0 ? m4 / (m2 * m2) - 3 : 0;
        double median = Percentile(sorted, 50), p10 = Percentile(sorted, 10), p90 = Percentile(sorted, 90);
        double p25 = Percentile(sorted, 25), p75 = Percentile(sorted, 75);
        double medAd = 0;
        foreach (var v in sorted) medAd += Math.Abs(v - median);
        return new DistributionStats(mean, m2, skew, kurt, median, sorted[0], p10, p25, p75, p90, sorted[n - 1],
            mad / n, RobustMad(sorted, p10, p90), medAd / n, Math.Sqrt(m2) / mean,
            (p75 - p25) / (p75 + p25), energy, Math.Sqrt(energy / n));
    }

    /// <summary>Percentile <paramref name="p"/> in per cent (Hyndman &amp; Fan type 7, <see cref="SampleStatistics.Percentile(ReadOnlySpan{double}, double)"/>).</summary>
    public static double Percentile(ReadOnlySpan<double> sorted, double p) => SampleStatistics.Percentile(sorted, p / 100.0);

    // IBSI 3.3.15: mean absolute deviation from the mean of the values within [P10, P90].
    private static double RobustMad(ReadOnlySpan<double> sorted, double p10, double p90)
    {
        double sum = 0; int count = 0;
        foreach (var v in sorted)
            if (v >= p10 && v <= p90) { sum += v; count++; }
        if (count == 0) return double.NaN;
        double mean = sum / count, dev = 0;
        foreach (var v in sorted)
            if (v >= p10 && v <= p90) dev += Math.Abs(v - mean);
        return dev / count;
    }
}
