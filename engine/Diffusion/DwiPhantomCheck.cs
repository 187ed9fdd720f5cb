using Serimetry.Engine.Core;

namespace Serimetry.Engine.Diffusion;

/// <summary>Options of <see cref="DwiPhantomCheck"/>.</summary>
/// <param name="ReferenceAdcUm2PerS">Reference ADC of every vial (10⁻⁶ mm²/s); default water at 0 °C, 1099.</param>
/// <param name="TolerancePercent">Pass when |bias| ≤ this (default 5 %, the upper end of the isocentre bias range
/// −2 % to +5 % observed on 35 clinical scanners, Malyarenko et al., JMRI 2013;37:1238; the QIBA profile's own
/// limit is not confirmed here — set it from the profile's conformance section).</param>
/// <param name="Fit">ADC fit options (default weighted log-linear over every b-value: a water phantom has no perfusion, so low b is not excluded).</param>
/// <param name="VialThresholdFraction">Vial search: voxels above this fraction of the 99th percentile of the lowest-b image.</param>
/// <param name="MinVialVoxels">Vial search: smallest connected component kept.</param>
/// <param name="RoiRadiusFraction">Vial search: ROI = voxels within this fraction of the vial's in-plane equivalent radius from its centre (edge voxels carry partial volume).</param>
/// <param name="ReferenceSource">Citation of the reference value, printed in reports.</param>
public sealed record DwiPhantomOptions(
    double ReferenceAdcUm2PerS = DwiPhantomCheck.IceWaterAdcUm2PerS,
    double TolerancePercent = 5,
    AdcFitOptions? Fit = null,
    double VialThresholdFraction = 0.5,
    int MinVialVoxels = 20,
    double RoiRadiusFraction = 0.6,
    string ReferenceSource = DwiPhantomCheck.IceWaterSource);

/// <summary>ADC of one vial against its reference.</summary>
public sealed record VialResult(int Label, int Voxels, Vec3 CentreMm, double MeanAdcUm2PerS, double SdAdcUm2PerS,
    double ReferenceUm2PerS, double BiasPercent, bool Pass);

/// <summary>Result of a DWI phantom check.</summary>
public sealed record DwiPhantomReport(IReadOnlyList<VialResult> Vials, bool Pass, double TolerancePercent, string ReferenceSource,
    IReadOnlyList<double> BValuesUsed);

/// <summary>
/// DWI phantom check (QIBA-style ice-water phantom QA, facts.md §2): fits ADC, measures each vial ROI (given as
/// a label mask, or found as bright connected components of the lowest-b image) and compares with the reference.
/// </summary>
public static class DwiPhantomCheck
{
    /// <summary>
    /// Diffusion coefficient of water at 0 °C, 1.099×10⁻³ mm²/s: Speedy-Angell law with Holz, Heil &amp; Sacco
    /// (PCCP 2000) parameters (D0 1.635e-8 m²/s, Ts 215.05 K, γ 2.063) [derived, facts.md §2]; QIBA uses 1.1.
    /// </summary>
    public const double IceWaterAdcUm2PerS = 1099;

    /// <summary>Citation of <see cref="IceWaterAdcUm2PerS"/>.</summary>
    public const string IceWaterSource =
        "water at 0 °C: Speedy-Angell law with Holz, Heil & Sacco, PCCP 2000 parameters = 1.099e-3 mm²/s (QIBA DWI Profile uses 1.1e-3)";

    /// <summary>D(T) = D0·(T/Ts − 1)^γ (Speedy-Angell form, Holz 2000 parameters) in 10⁻⁶ mm²/s, T in °C.</summary>
    public static double WaterAdcUm2PerS(double temperatureC)
    {
        double t = temperatureC + 273.15;
        if (!(t > 215.05)) throw new InvalidParameterException($"temperature {temperatureC} °C is outside the law's range", "phantom temperature");
        return 1.635e-8 * Math.Pow(t / 215.05 - 1, 2.063) * 1e12;
    }

    /// <summary>Runs the check; <paramref name="rois"/> labels vials by value (null = find vials).</summary>
    public static DwiPhantomReport Run(IReadOnlyList<DwiImage> dwi, Volume<byte>? rois = null, DwiPhantomOptions? options = null)
    {
        options ??= new DwiPhantomOptions();
        if (!(options.TolerancePercent > 0) || !(options.ReferenceAdcUm2PerS > 0))
            throw new InvalidParameterException("tolerance and reference ADC must be positive", "DWI phantom options");
        var fit = AdcFitter.Fit(dwi, null, options.Fit ?? new AdcFitOptions(MinBValue: 0));
        var lowest = dwi.MinBy(d => d.BValue)!.Image;
        rois ??= VialFinder.Find(lowest, options);
        rois.Geometry.RequireCongruent(fit.AdcUm2PerS.Geometry, "phantom ROI mask and DWI images");
        var vials = Measure(fit.AdcUm2PerS, rois, options);
        if (vials.Count == 0)
            throw new InputFormatException("no vial ROI found", "DWI phantom", "give an ROI mask, or check the phantom is in the field of view");
        return new DwiPhantomReport(vials, vials.All(v => v.Pass), options.TolerancePercent, options.ReferenceSource, fit.BValuesUsed);
    }

    private static List<VialResult> Measure(Volume<float> adc, Volume<byte> rois, DwiPhantomOptions options)
    {
        var results = new List<VialResult>();
        for (int label = 1; label <= 255; label++)
        {
            double sum = 0, sumSq = 0;
            var centre = Vec3.Zero;
            int n = 0;
            for (int k = 0; k < adc.Size.Z; k++)
                for (int j = 0; j < adc.Size.Y; j++)
                    for (int i = 0; i < adc.Size.X; i++)
                    {
                        int v = adc.LinearIndex(i, j, k);
                        if (rois.Voxels[v] != label) continue;
                        sum += adc.Voxels[v]; sumSq += (double)adc.Voxels[v] * adc.Voxels[v]; n++;
                        centre += adc.Geometry.IndexToPhysical(i, j, k);
                    }
            if (n == 0) continue;
            double mean = sum / n, sd = n > 1 ? Math.Sqrt(Math.Max(0, (sumSq - n * mean * mean) / (n - 1))) : 0;
            double bias = 100 * (mean - options.ReferenceAdcUm2PerS) / options.ReferenceAdcUm2PerS;
            results.Add(new VialResult(label, n, centre / n, mean, sd, options.ReferenceAdcUm2PerS, bias, Math.Abs(bias) <= options.TolerancePercent));
        }
        return results;
    }
}
