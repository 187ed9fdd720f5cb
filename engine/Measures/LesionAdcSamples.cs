using Serimetry.Engine.Core;

namespace Serimetry.Engine.Measures;

/// <summary>The finite ADC values (10^-6 mm²/s) of the lesion, ascending, with what was left out.</summary>
/// <param name="Values">Finite ADC samples, sorted ascending.</param>
/// <param name="LesionVoxelsOnAdcGrid">ADC voxels whose centre falls inside the lesion mask.</param>
/// <param name="NonFiniteExcluded">Lesion voxels whose ADC was NaN or ±Inf (dropped, NaN policy).</param>
public sealed record LesionSamples(float[] Values, int LesionVoxelsOnAdcGrid, int NonFiniteExcluded);

/// <summary>
/// Collects the lesion's ADC samples on the ADC map's own grid: the lesion mask is carried onto the ADC
/// grid by nearest neighbour (an ADC voxel belongs to the lesion when its centre lies in a lesion voxel),
/// so ADC values are never interpolated. Shared (cached per visit) by all <c>lesion.adc.*</c> measures and
/// by the histogram distances between visits.
/// </summary>
public static class LesionAdcSamples
{
    /// <summary>The samples, or null with a reason when the ADC map or lesion mask is missing or the lesion is empty on the ADC grid.</summary>
    public static LesionSamples? Collect(VisitContext context, out string? reason)
    {
        reason = null;
        if (context.Adc is null) { reason = "no ADC map was given for this visit"; return null; }
        if (context.LesionMask is null) { reason = "no lesion mask was given for this visit"; return null; }
        var samples = context.Cached("adc:lesion", () => Gather(context.Adc, context.LesionMask));
        if (samples.LesionVoxelsOnAdcGrid == 0) { reason = "the lesion mask is empty on the ADC grid"; return null; }
        if (samples.Values.Length == 0) { reason = "no finite ADC value inside the lesion"; return null; }
        return samples;
    }

    /// <summary>Finite values of <paramref name="image"/> inside <paramref name="mask"/> (carried to the image grid), ascending.</summary>
    internal static LesionSamples Gather(Volume<float> image, Volume<byte> mask)
    {
        var onGrid = MaskGrid.OnGrid(mask, image.Geometry).Voxels;
        var v = image.Voxels;
        int inside = MaskGrid.Count(onGrid), nonFinite = 0, n = 0;
        var values = new float[inside];
        for (int o = 0; o < v.Length; o++)
        {
            if (onGrid[o] == 0) continue;
            if (float.IsFinite(v[o])) values[n++] = v[o];
            else nonFinite++;
        }
        Array.Resize(ref values, n);
        Array.Sort(values);
        return new LesionSamples(values, inside, nonFinite);
    }
}
