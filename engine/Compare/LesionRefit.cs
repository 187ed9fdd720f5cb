using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Settings of the lesion re-fit. The defaults are our own choices, documented in docs/compare.md.
/// </summary>
/// <param name="SearchMarginMm">How far beyond the propagated outline the lesion may grow.</param>
/// <param name="ShellMm">Thickness of the peri-lesional shell (inside the gland) that models background tissue.</param>
/// <param name="MinSeparationSds">Below this class separation (in pooled SDs) the re-fit is refused and the propagated outline kept.</param>
public sealed record LesionRefitSettings(double SearchMarginMm = 5.0, double ShellMm = 4.0, double MinSeparationSds = 1.0);

/// <summary>Mean and SD of one channel in lesion and in background tissue.</summary>
internal readonly record struct ChannelModel(double LesionMean, double BackgroundMean, double PooledSd)
{
    /// <summary>Linear discriminant weight and midpoint: score = w·(x − mid).</summary>
    public double Weight => (LesionMean - BackgroundMean) / (PooledSd * PooledSd);

    public double Midpoint => 0.5 * (LesionMean + BackgroundMean);

    public double SeparationSds => Math.Abs(LesionMean - BackgroundMean) / PooledSd;
}

/// <summary>
/// The lesion model learned at baseline: lesion and background means with the pooled SD, for ADC
/// (10^-6 mm²/s) and for T2w divided by the local shell median.
/// </summary>
public sealed record LesionModel(double AdcLesionMean, double AdcBackgroundMean, double AdcPooledSd,
    double T2LesionMean, double T2BackgroundMean, double T2PooledSd)
{
    internal ChannelModel Adc => new(AdcLesionMean, AdcBackgroundMean, AdcPooledSd);
    internal ChannelModel T2 => new(T2LesionMean, T2BackgroundMean, T2PooledSd);
}

/// <summary>Outcome of one re-fit.</summary>
/// <param name="Mask">The re-fitted lesion on the visit's T2w grid.</param>
/// <param name="Refitted">False when the propagated outline was kept (reason in <paramref name="Note"/>).</param>
/// <param name="Note">Why the propagated outline was kept, or null.</param>
public sealed record LesionRefitResult(Volume<byte> Mask, bool Refitted, string? Note);

/// <summary>
/// Re-fits a lesion outline on a visit's own images. A two-class linear discriminant on ADC and on T2w
/// (normalised by the median of a peri-lesional shell inside the gland, which cancels smooth bias fields and
/// scanner scaling) is learned once from the baseline outline; on each visit the voxels within a search margin
/// around the propagated outline (and inside the dilated gland) that score as lesion form the new outline,
/// keeping the connected pieces that touch the propagated outline and filling cavities. The same rule is
/// applied at baseline, so every visit is measured by one method.
/// </summary>
public static class LesionRefit
{
    /// <summary>Learns the model from the baseline T2w, ADC (on the T2w grid) and masks.</summary>
    public static LesionModel Learn(Volume<float> t2w, Volume<float> adcOnT2w, Volume<byte> lesion, Volume<byte> gland, LesionRefitSettings settings)
    {
        t2w.Geometry.RequireCongruent(lesion.Geometry, "baseline T2w and lesion mask");
        var shell = Shell(lesion, gland, settings.ShellMm);
        double t2Ref = Median(t2w, shell);
        if (!(t2Ref > 0)) throw new InputFormatException("the tissue around the baseline lesion has no positive T2w signal", "baseline lesion mask");
        var (tl, tlv, tln) = Moments(t2w, lesion, 1 / t2Ref);
        var (tb, tbv, tbn) = Moments(t2w, shell, 1 / t2Ref);
        var (al, alv, aln) = Moments(adcOnT2w, lesion, 1);
        var (ab, abv, abn) = Moments(adcOnT2w, shell, 1);
        if (tln < 3 || tbn < 3) throw new InputFormatException("the baseline lesion or its surrounding gland tissue has fewer than 3 voxels", "baseline lesion mask");
        return new LesionModel(al, ab, PooledSd(alv, aln, abv, abn, al, ab), tl, tb, PooledSd(tlv, tln, tbv, tbn, tl, tb));
    }

    /// <summary>Re-fits the lesion on one visit.</summary>
    public static LesionRefitResult Refit(Volume<float> t2w, Volume<float> adcOnT2w, Volume<byte> propagatedLesion, Volume<byte> gland,
        LesionModel model, LesionRefitSettings settings)
    {
        t2w.Geometry.RequireCongruent(propagatedLesion.Geometry, "visit T2w and propagated lesion");
        if (MaskOps.Count(propagatedLesion) == 0)
            return new LesionRefitResult(propagatedLesion, false, "propagated lesion is empty (outside the follow-up field of view?)");
        var adc = model.Adc;
        var t2 = model.T2;
        bool useAdc = adc.SeparationSds >= settings.MinSeparationSds;
        bool useT2 = t2.SeparationSds >= settings.MinSeparationSds;
        if (!useAdc && !useT2)
            return new LesionRefitResult(propagatedLesion, false,
                $"lesion and surrounding tissue differ by less than {settings.MinSeparationSds} SD on both ADC and T2w; propagated outline kept");
        double t2Ref = Median(t2w, Shell(propagatedLesion, gland, settings.ShellMm));
        if (!(t2Ref > 0)) useT2 = false;
        var search = MaskOps.Dilate(propagatedLesion, settings.SearchMarginMm);
        var glandZone = MaskOps.Dilate(gland, 1.0);
        var candidate = propagatedLesion.Like<byte>();
        var tv = t2w.Voxels;
        var av = adcOnT2w.Voxels;
        for (int n = 0; n < tv.Length; n++)
        {
            if (search.Voxels[n] == 0 || glandZone.Voxels[n] == 0) continue;
            double score = 0;
            if (useAdc && float.IsFinite(av[n])) score += adc.Weight * (av[n] - adc.Midpoint);
            if (useT2 && float.IsFinite(tv[n])) score += t2.Weight * (tv[n] / t2Ref - t2.Midpoint);
            candidate.Voxels[n] = score > 0 ? (byte)1 : (byte)0;
        }
        var kept = MaskOps.FillHoles(MaskOps.ComponentsTouching(candidate, propagatedLesion));
        if (MaskOps.Count(kept) == 0)
            return new LesionRefitResult(propagatedLesion, false, "no voxel near the propagated outline looks like the baseline lesion; propagated outline kept");
        return new LesionRefitResult(kept, true, null);
    }

    /// <summary>Gland voxels within <paramref name="mm"/> of the lesion, excluding the lesion.</summary>
    internal static Volume<byte> Shell(Volume<byte> lesion, Volume<byte> gland, double mm) =>
        MaskOps.Subtract(MaskOps.And(MaskOps.Dilate(lesion, mm), gland), lesion);

    private static (double Mean, double Var, long N) Moments(Volume<float> image, Volume<byte> mask, double scale)
    {
        double mean = 0, m2 = 0;
        long n = 0;
        for (int i = 0; i < mask.Voxels.Length; i++)
        {
            if (mask.Voxels[i] == 0) continue;
            double x = image.Voxels[i] * scale;
            if (!double.IsFinite(x)) continue;
            n++;
            double d = x - mean;
            mean += d / n;
            m2 += d * (x - mean);
        }
        return (mean, n > 1 ? m2 / (n - 1) : 0, n);
    }

    private static double PooledSd(double v1, long n1, double v2, long n2, double m1, double m2)
    {
        double pooled = Math.Sqrt(((n1 - 1) * v1 + (n2 - 1) * v2) / Math.Max(1, n1 + n2 - 2));
        double floor = 0.05 * Math.Abs(m1 - m2) + 1e-9;
        return Math.Max(pooled, floor);
    }

    private static double Median(Volume<float> image, Volume<byte> mask)
    {
        var values = new List<float>();
        for (int i = 0; i < mask.Voxels.Length; i++)
            if (mask.Voxels[i] != 0 && float.IsFinite(image.Voxels[i])) values.Add(image.Voxels[i]);
        if (values.Count == 0) return double.NaN;
        values.Sort();
        int h = values.Count / 2;
        return values.Count % 2 == 1 ? values[h] : 0.5 * (values[h - 1] + values[h]);
    }
}
