using Serimetry.Engine.Core;

namespace Serimetry.Engine.Radiomics.Preparation;

/// <summary>Intensity discretisation as defined in IBSI reference manual section 2.7.</summary>
internal static class Discretiser
{
    /// <summary>Discretises the intensity-mask voxels; voxels outside get level 0.</summary>
    public static DiscreteLevels Discretise(double[] intensity, byte[] inRoi, DiscretisationSettings s,
        double? resegMin, string where, int maxBins = 65536)
    {
        double min = double.PositiveInfinity, max = double.NegativeInfinity;
        for (int n = 0; n < intensity.Length; n++)
        {
            if (inRoi[n] == 0) continue;
            double v = intensity[n];
            if (v < min) min = v;
            if (v > max) max = v;
        }
        var levels = new int[intensity.Length];
        var result = s.Method switch
        {
            DiscretisationMethod.FixedBinNumber => FixedBinNumber(intensity, inRoi, levels, s, min, max, where),
            DiscretisationMethod.FixedBinSize => FixedBinSize(intensity, inRoi, levels, s, s.LowerBound ?? resegMin ?? min, max, where),
            _ => Direct(intensity, inRoi, levels, min, max),
        };
        if (result.BinCount > maxBins)
            throw new InvalidParameterException($"discretisation gives {result.BinCount} grey levels; at most {maxBins} are allowed here",
                where, "use fewer bins (binCount) or a larger bin width (binWidth)");
        return result;
    }

    private static DiscreteLevels FixedBinNumber(double[] x, byte[] inRoi, int[] levels, DiscretisationSettings s,
        double min, double max, string where)
    {
        int ng = s.BinCount;
        if (ng < 1 || ng > 65536)
            throw new InvalidParameterException($"bin count {ng} must be 1..65536", where + ".binCount");
        double range = max - min;
        for (int n = 0; n < x.Length; n++)
        {
            if (inRoi[n] == 0) continue;
            // Constant ROI (range 0): every voxel falls in bin 1 (documented NaN policy).
            int b = range > 0 ? (int)Math.Floor(ng * (x[n] - min) / range) + 1 : 1;
            levels[n] = Math.Min(b, ng);
        }
        // IVH with FBN uses the bin numbers as intensities (IBSI 4.5).
        return new DiscreteLevels(levels, ng, 0, 1);
    }

    private static DiscreteLevels FixedBinSize(double[] x, byte[] inRoi, int[] levels, DiscretisationSettings s,
        double lower, double max, string where)
    {
        double w = s.BinWidth;
        if (!(w > 0) || !double.IsFinite(w))
            throw new InvalidParameterException($"bin width {w} must be positive", where + ".binWidth");
        long ngLong = (long)Math.Floor((max - lower) / w) + 1;
        if (ngLong > 65536)
            throw new InvalidParameterException($"bin width {w} gives {ngLong} bins over [{lower}, {max}]",
                where + ".binWidth", "use a larger bin width (at most 65536 bins)");
        int ng = (int)Math.Max(1, ngLong);
        for (int n = 0; n < x.Length; n++)
        {
            if (inRoi[n] == 0) continue;
            int b = (int)Math.Floor((x[n] - lower) / w) + 1;
            levels[n] = Math.Clamp(b, 1, ng);
        }
        // Representative intensity of bin i is its centre: lower + (i − 0.5)·w.
        return new DiscreteLevels(levels, ng, lower - 0.5 * w, w);
    }

    private static DiscreteLevels Direct(double[] x, byte[] inRoi, int[] levels, double min, double max)
    {
        double lo = Math.Round(min, MidpointRounding.AwayFromZero);
        int ng = (int)(Math.Round(max, MidpointRounding.AwayFromZero) - lo) + 1;
        if (ng > 65536)
            throw new InvalidParameterException($"intensities span {ng} integer levels; at most 65536 are allowed without binning",
                "discretisation.method", "use FixedBinNumber or FixedBinSize");
        for (int n = 0; n < x.Length; n++)
        {
            if (inRoi[n] == 0) continue;
            levels[n] = (int)(Math.Round(x[n], MidpointRounding.AwayFromZero) - lo) + 1;
        }
        return new DiscreteLevels(levels, ng, lo - 1, 1);
    }
}
