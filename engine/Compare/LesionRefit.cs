using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Settings of the lesion re-fit. The defaults are our own choices, documented in docs/compare.md.
/// </summary>
/// <param name="SearchMarginMm">How far beyond the propagated outline the lesion may grow.</param>
/// <param name="ShellMm">Thickness of the peri-lesional shell (inside the gland) that models background tissue.</param>
/// <param name="MinSeparationSds">Below this separation (in pooled SDs) between lesion and the nearest background tissue the re-fit is refused.</param>
/// <param name="BackgroundClusters">At most this many background tissue classes are learned from the shell (e.g. peripheral and transition zone).</param>
public sealed record LesionRefitSettings(double SearchMarginMm = 5.0, double ShellMm = 4.0, double MinSeparationSds = 1.0, int BackgroundClusters = 3);

/// <summary>
/// The lesion model learned at baseline, in two channels: ADC (10^-6 mm²/s) and T2w divided by the median of
/// the peri-lesional shell. <see cref="Scale"/> is the pooled within-class SD of each channel; the lesion and
/// each background tissue class are represented by their means.
/// </summary>
/// <param name="Lesion">Lesion mean (ADC, T2 relative).</param>
/// <param name="Background">Means of the background tissue classes found around the lesion.</param>
/// <param name="Scale">Pooled within-class SD per channel (ADC, T2 relative).</param>
public sealed record LesionModel(ChannelPair Lesion, IReadOnlyList<ChannelPair> Background, ChannelPair Scale)
{
    /// <summary>Standardised distance between the lesion and the nearest background class.</summary>
    public double SeparationSds => Background.Min(b => Lesion.DistanceTo(b, Scale));
}

/// <summary>A value in each channel: ADC and relative T2.</summary>
public readonly record struct ChannelPair(double Adc, double T2)
{
    /// <summary>Euclidean distance after dividing each channel by <paramref name="scale"/>; NaN channels are left out.</summary>
    public double DistanceTo(ChannelPair o, ChannelPair scale)
    {
        double s = 0;
        if (double.IsFinite(Adc) && double.IsFinite(o.Adc)) s += Sq((Adc - o.Adc) / scale.Adc);
        if (double.IsFinite(T2) && double.IsFinite(o.T2)) s += Sq((T2 - o.T2) / scale.T2);
        return Math.Sqrt(s);
    }

    private static double Sq(double x) => x * x;
}

/// <summary>Outcome of one re-fit.</summary>
/// <param name="Mask">The re-fitted lesion on the visit's T2w grid.</param>
/// <param name="Refitted">False when the propagated outline was kept (reason in <paramref name="Note"/>).</param>
/// <param name="Note">Why the propagated outline was kept, or null.</param>
public sealed record LesionRefitResult(Volume<byte> Mask, bool Refitted, string? Note)
{
    /// <summary>
    /// Partial-volume occupancy (0-1 per voxel, <see cref="Mask"/>'s grid) of the re-fitted lesion, or null when it
    /// could not be estimated (the binary outline then stands; reason in <see cref="OccupancyNote"/>).
    /// </summary>
    public Volume<float>? Occupancy { get; init; }

    /// <summary>Why no occupancy was estimated, or null.</summary>
    public string? OccupancyNote { get; init; }
}

/// <summary>
/// Re-fits a lesion outline on a visit's own images. At baseline the lesion's mean ADC and relative T2w, and
/// the tissue classes around it (k-means in the standardised two-channel space over a peri-lesional shell
/// inside the gland, kept clear of the lesion edge by half the coarsest voxel so partial-volume voxels do not
/// form a class), are learned once. On each visit a voxel within the search margin around the propagated
/// outline (and inside the dilated gland) is lesion when it is nearer the lesion mean than every background
/// class mean (a nearest-mean rule, i.e. every pairwise linear discriminant with shared variances agrees); the
/// connected pieces touching the propagated outline are kept and cavities filled. T2w is divided by the local
/// shell median on each visit, which cancels smooth bias fields and scanner scaling. The same rule is applied
/// at baseline, so every visit is measured by one method.
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
        var lesionSamples = Samples(t2w, adcOnT2w, lesion, t2Ref);
        var shellSamples = Samples(t2w, adcOnT2w, shell, t2Ref);
        if (lesionSamples.Count < 3 || shellSamples.Count < 3)
            throw new InputFormatException("the baseline lesion or its surrounding gland tissue has fewer than 3 voxels", "baseline lesion mask");
        var lesionMean = Mean(lesionSamples);
        var (centres, scale) = TissueClasses.Fit(shellSamples, lesionSamples, lesionMean, settings.BackgroundClusters);
        return new LesionModel(lesionMean, centres, scale);
    }

    /// <summary>Re-fits the lesion on one visit.</summary>
    public static LesionRefitResult Refit(Volume<float> t2w, Volume<float> adcOnT2w, Volume<byte> propagatedLesion, Volume<byte> gland,
        LesionModel model, LesionRefitSettings settings)
    {
        t2w.Geometry.RequireCongruent(propagatedLesion.Geometry, "visit T2w and propagated lesion");
        if (MaskOps.Count(propagatedLesion) == 0)
            return new LesionRefitResult(propagatedLesion, false, "propagated lesion is empty (outside the follow-up field of view?)");
        if (model.SeparationSds < settings.MinSeparationSds)
            return new LesionRefitResult(propagatedLesion, false,
                $"lesion and surrounding tissue differ by less than {settings.MinSeparationSds} SD; propagated outline kept");
        double t2Ref = Median(t2w, Shell(propagatedLesion, gland, settings.ShellMm));
        var region = MaskOps.Dilate(gland, 1.0);
        var search = MaskOps.And(MaskOps.Dilate(propagatedLesion, settings.SearchMarginMm), region);
        var candidate = propagatedLesion.Like<byte>();
        var tv = t2w.Voxels;
        var av = adcOnT2w.Voxels;
        for (int n = 0; n < tv.Length; n++)
        {
            if (search.Voxels[n] == 0) continue;
            var x = new ChannelPair(av[n], t2Ref > 0 ? tv[n] / t2Ref : double.NaN);
            double toLesion = x.DistanceTo(model.Lesion, model.Scale);
            bool lesionLike = true;
            foreach (var b in model.Background)
                if (x.DistanceTo(b, model.Scale) <= toLesion) { lesionLike = false; break; }
            candidate.Voxels[n] = lesionLike ? (byte)1 : (byte)0;
        }
        var kept = MaskOps.FillHoles(MaskOps.ComponentsTouching(candidate, propagatedLesion));
        if (MaskOps.Count(kept) == 0)
            return new LesionRefitResult(propagatedLesion, false, "no voxel near the propagated outline looks like the baseline lesion; propagated outline kept");
        var occupancy = LesionOccupancy.Estimate(t2w, kept, region, out var why);
        return new LesionRefitResult(kept, true, null) { Occupancy = occupancy, OccupancyNote = why };
    }

    /// <summary>
    /// Gland voxels between <c>gap</c> and <c>gap + mm</c> from the lesion, where gap is half the coarsest voxel
    /// spacing: tissue near the lesion but clear of its partial-volume edge.
    /// </summary>
    internal static Volume<byte> Shell(Volume<byte> lesion, Volume<byte> gland, double mm)
    {
        var sp = lesion.Geometry.SpacingMm;
        double gap = Math.Max(sp.X, Math.Max(sp.Y, sp.Z));
        var inner = MaskOps.Dilate(lesion, gap);
        return MaskOps.Subtract(MaskOps.And(MaskOps.Dilate(lesion, gap + mm), gland), inner);
    }

    private static List<ChannelPair> Samples(Volume<float> t2w, Volume<float> adc, Volume<byte> mask, double t2Ref)
    {
        var list = new List<ChannelPair>();
        for (int n = 0; n < mask.Voxels.Length; n++)
        {
            if (mask.Voxels[n] == 0) continue;
            double a = adc.Voxels[n], t = t2w.Voxels[n] / t2Ref;
            if (double.IsFinite(a) && double.IsFinite(t)) list.Add(new ChannelPair(a, t));
        }
        return list;
    }

    internal static ChannelPair Mean(IReadOnlyList<ChannelPair> x)
    {
        double a = 0, t = 0;
        foreach (var p in x) { a += p.Adc; t += p.T2; }
        return new ChannelPair(a / x.Count, t / x.Count);
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
