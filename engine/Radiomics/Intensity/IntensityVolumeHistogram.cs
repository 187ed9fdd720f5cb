using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Intensity;

/// <summary>
/// Intensity-volume histogram (IBSI 3.5, family P88C) on the IVH discretisation: volume fraction
/// ν(i) = fraction of ROI voxels with level ≥ i, intensity fraction γ(i) = (X_i − X_1)/(X_Ng − X_1).
/// </summary>
internal static class IntensityVolumeHistogram
{
    public static void Compute(RoiData roi, FeatureSink sink)
    {
        var ivh = roi.Ivh;
        int ng = ivh.BinCount;
        var atLeast = new double[ng + 2];
        for (int n = 0; n < roi.Count; n++)
            if (roi.InRoi[n] != 0) atLeast[ivh.Levels[n]]++;
        // Suffix sums: atLeast[i] = fraction of voxels with level ≥ i.
        double total = roi.RoiVoxelCount;
        for (int i = ng; i >= 1; i--) atLeast[i] += atLeast[i + 1];
        for (int i = 1; i <= ng + 1; i++) atLeast[i] /= total;

        double v10 = VolumeAt(atLeast, ivh, 0.10), v90 = VolumeAt(atLeast, ivh, 0.90);
        double i10 = IntensityAt(atLeast, ivh, 0.10), i90 = IntensityAt(atLeast, ivh, 0.90);
        void Add(string name, string code, double v) => sink.Add(FamilyNames.IntensityVolumeHistogram, name, code, IbsiAggregation.None, v);
        Add("Volume at intensity fraction (V10)", "BC2M", v10);
        Add("Volume at intensity fraction (V90)", "BC2M", v90);
        Add("Intensity at volume fraction (I10)", "GBPN", i10);
        Add("Intensity at volume fraction (I90)", "GBPN", i90);
        Add("Volume fraction difference between intensity fractions", "DDTU", v10 - v90);
        Add("Intensity fraction difference between volume fractions", "CNV2", i10 - i90);
        // IBSI publishes no reference value for the area under the IVH curve (not standardised).
        Add("Area under the IVH curve", "9CMM", AreaUnderCurve(atLeast, ivh));
    }

    // Trapezoidal area under ν(γ) over the intensity fractions of levels 1..N_g.
    private static double AreaUnderCurve(double[] atLeast, DiscreteLevels ivh)
    {
        int ng = ivh.BinCount;
        if (ng == 1) return double.NaN;
        double lo = ivh.ValueOf(1), hi = ivh.ValueOf(ng), area = 0;
        for (int i = 1; i < ng; i++)
            area += 0.5 * (atLeast[i] + atLeast[i + 1]) * (ivh.ValueOf(i + 1) - ivh.ValueOf(i)) / (hi - lo);
        return area;
    }

    // V_x: volume fraction at the first level whose intensity fraction is at least x.
    private static double VolumeAt(double[] atLeast, DiscreteLevels ivh, double x)
    {
        int ng = ivh.BinCount;
        if (ng == 1) return atLeast[1];
        double lo = ivh.ValueOf(1), hi = ivh.ValueOf(ng);
        for (int i = 1; i <= ng; i++)
            if ((ivh.ValueOf(i) - lo) / (hi - lo) >= x - 1e-12) return atLeast[i];
        return 0;
    }

    // I_x: the lowest intensity at which at most a fraction x of the volume has that intensity or more.
    private static double IntensityAt(double[] atLeast, DiscreteLevels ivh, double x)
    {
        for (int i = 1; i <= ivh.BinCount + 1; i++)
            if (atLeast[i] <= x + 1e-12) return ivh.ValueOf(i);
        return ivh.ValueOf(ivh.BinCount + 1);
    }
}
