using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Intensity;

/// <summary>
/// Intensity-based statistics (IBSI 3.3, family UHIW) on the intensity-mask intensities, and the intensity
/// histogram (IBSI 3.4, family ZVCW) on the discretised levels. Both refer to the whole 3D ROI (no aggregation code).
/// </summary>
internal static class IntensityFamilies
{
    public static void Statistics(RoiData roi, FeatureSink sink)
    {
        var values = RoiValues(roi, useLevels: false);
        var s = DistributionStats.Of(values);
        void Add(string name, string code, double v) => sink.Add(FamilyNames.IntensityStatistics, name, code, IbsiAggregation.None, v);
        Add("Mean intensity", "Q4LE", s.Mean);
        Add("Intensity variance", "ECT3", s.Variance);
        Add("Intensity skewness", "KE2A", s.Skewness);
        Add("(Excess) intensity kurtosis", "IPH6", s.Kurtosis);
        Add("Median intensity", "Y12H", s.Median);
        Add("Minimum intensity", "1GSF", s.Min);
        Add("10th intensity percentile", "QG58", s.P10);
        Add("90th intensity percentile", "8DWT", s.P90);
        Add("Maximum intensity", "84IY", s.Max);
        Add("Intensity interquartile range", "SALO", s.P75 - s.P25);
        Add("Intensity range", "2OJQ", s.Max - s.Min);
        Add("Intensity-based mean absolute deviation", "4FUA", s.MeanAbsDev);
        Add("Intensity-based robust mean absolute deviation", "1128", s.RobustMeanAbsDev);
        Add("Intensity-based median absolute deviation", "N72L", s.MedianAbsDev);
        Add("Intensity-based coefficient of variation", "7TET", s.CoefficientOfVariation);
        Add("Intensity-based quartile coefficient of dispersion", "9S40", s.QuartileCoefficient);
        Add("Intensity-based energy", "N8CA", s.Energy);
        Add("Root mean square intensity", "5ZWQ", s.RootMeanSquare);
    }

    public static void Histogram(RoiData roi, FeatureSink sink)
    {
        var values = RoiValues(roi, useLevels: true);
        var s = DistributionStats.Of(values);
        void Add(string name, string code, double v) => sink.Add(FamilyNames.IntensityHistogram, name, code, IbsiAggregation.None, v);
        Add("Mean discretised intensity", "X6K6", s.Mean);
        Add("Discretised intensity variance", "CH89", s.Variance);
        Add("Discretised intensity skewness", "88K1", s.Skewness);
        Add("(Excess) discretised intensity kurtosis", "C3I7", s.Kurtosis);
        Add("Median discretised intensity", "WIFQ", s.Median);
        Add("Minimum discretised intensity", "1PR8", s.Min);
        // The IBSI documentation lists 1PR8 for both the minimum and the 10th percentile.
        Add("10th discretised intensity percentile", "1PR8", s.P10);
        Add("90th discretised intensity percentile", "GPMT", s.P90);
        Add("Maximum discretised intensity", "3NCY", s.Max);
        var h = Counts(roi);
        Add("Intensity histogram mode", "AMMC", Mode(h));
        Add("Discretised intensity interquartile range", "WR0O", s.P75 - s.P25);
        Add("Discretised intensity range", "5Z3W", s.Max - s.Min);
        Add("Intensity histogram mean absolute deviation", "D2ZX", s.MeanAbsDev);
        Add("Intensity histogram robust mean absolute deviation", "WRZB", s.RobustMeanAbsDev);
        Add("Intensity histogram median absolute deviation", "4RNL", s.MedianAbsDev);
        Add("Intensity histogram coefficient of variation", "CWYJ", s.CoefficientOfVariation);
        Add("Intensity histogram quartile coefficient of dispersion", "SLWD", s.QuartileCoefficient);
        double entropy = 0, uniformity = 0, n = values.Length;
        foreach (var c in h)
        {
            if (c == 0) continue;
            double p = c / n;
            entropy -= p * Math.Log2(p);
            uniformity += p * p;
        }
        Add("Discretised intensity entropy", "TLU2", entropy);
        Add("Discretised intensity uniformity", "BJ5W", uniformity);
        Gradients(h, out double gMax, out int iMax, out double gMin, out int iMin);
        Add("Maximum histogram gradient", "12CE", gMax);
        Add("Maximum histogram gradient intensity", "8E6O", iMax);
        Add("Minimum histogram gradient", "VQB3", gMin);
        Add("Minimum histogram gradient intensity", "RHQZ", iMin);
    }

    /// <summary>Intensity-mask values (raw or discretised), sorted ascending.</summary>
    internal static double[] RoiValues(RoiData roi, bool useLevels)
    {
        var values = new double[roi.RoiVoxelCount];
        int c = 0;
        for (int n = 0; n < roi.Count; n++)
            if (roi.InRoi[n] != 0) values[c++] = useLevels ? roi.Levels[n] : roi.Intensity[n];
        Array.Sort(values);
        return values;
    }

    /// <summary>Histogram counts; index i−1 holds grey level i.</summary>
    internal static long[] Counts(RoiData roi)
    {
        var h = new long[roi.BinCount];
        for (int n = 0; n < roi.Count; n++)
            if (roi.InRoi[n] != 0) h[roi.Levels[n] - 1]++;
        return h;
    }

    private static int Mode(long[] h)
    {
        int best = 0;
        for (int i = 1; i < h.Length; i++) if (h[i] > h[best]) best = i;
        return best + 1;
    }

    // IBSI 3.4.20: central differences inside, one-sided at the first and last bin.
    private static void Gradients(long[] h, out double gMax, out int iMax, out double gMin, out int iMin)
    {
        gMax = double.NegativeInfinity; gMin = double.PositiveInfinity; iMax = iMin = 1;
        int ng = h.Length;
        if (ng == 1) { gMax = gMin = 0; return; }
        for (int i = 0; i < ng; i++)
        {
            double g = i == 0 ? h[1] - h[0] : i == ng - 1 ? h[ng - 1] - h[ng - 2] : 0.5 * (h[i + 1] - h[i - 1]);
            if (g > gMax) { gMax = g; iMax = i + 1; }
            if (g < gMin) { gMin = g; iMin = i + 1; }
        }
    }
}
