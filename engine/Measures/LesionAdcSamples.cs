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
    /// <summary>Fewest ADC samples taken by the footprint rule before it falls back to the fullest voxels.</summary>
    public const int MinSamples = 10;

    /// <summary>The samples, or null with a reason when the ADC map or lesion mask is missing or the lesion is empty on the ADC grid.</summary>
    public static LesionSamples? Collect(VisitContext context, out string? reason)
    {
        reason = null;
        if (context.Adc is null) { reason = "no ADC map was given for this visit"; return null; }
        if (context.LesionMask is null) { reason = "no lesion mask was given for this visit"; return null; }
        var samples = context.Cached("adc:lesion", () => Gather(context.Adc, context.LesionMask, context.LesionOccupancy, context.Settings.AdcMinLesionFraction));
        if (samples.LesionVoxelsOnAdcGrid == 0) { reason = "the lesion mask is empty on the ADC grid"; return null; }
        if (samples.Values.Length == 0) { reason = "no finite ADC value inside the lesion"; return null; }
        return samples;
    }

    /// <summary>
    /// Finite values of <paramref name="image"/> in the lesion, ascending. On a mask grid finer than the image
    /// (mask voxel under half an image voxel) an image voxel is a lesion sample when the lesion fills at least
    /// <paramref name="minFraction"/> of it: the mean over the mask voxels whose centres fall in it of the
    /// occupancy (or the 0/1 mask); otherwise the mask is carried by nearest neighbour (centre rule).
    /// </summary>
    internal static LesionSamples Gather(Volume<float> image, Volume<byte> mask, Volume<float>? occupancy = null, double minFraction = 0.5)
    {
        occupancy?.Geometry.RequireCongruent(mask.Geometry, "lesion occupancy and lesion mask");
        var selected = mask.Geometry.VoxelVolumeMm3 < 0.5 * image.Geometry.VoxelVolumeMm3
            ? ByFootprint(image.Geometry, mask, occupancy, minFraction)
            : MaskGrid.OnGrid(mask, image.Geometry).Voxels;
        var v = image.Voxels;
        int inside = MaskGrid.Count(selected), nonFinite = 0, n = 0;
        var values = new float[inside];
        for (int o = 0; o < v.Length; o++)
        {
            if (selected[o] == 0) continue;
            if (float.IsFinite(v[o])) values[n++] = v[o];
            else nonFinite++;
        }
        Array.Resize(ref values, n);
        Array.Sort(values);
        return new LesionSamples(values, inside, nonFinite);
    }

    /// <summary>
    /// Image voxels the lesion fills to at least <paramref name="minFraction"/>: each mask voxel centre near the lesion
    /// is assigned to the image voxel containing it (index rounding), and the image voxel's fraction is the mean
    /// occupancy of the mask voxels assigned to it.
    /// </summary>
    private static byte[] ByFootprint(Geometry image, Volume<byte> mask, Volume<float>? occupancy, double minFraction)
    {
        var sum = new float[(int)image.VoxelCount];
        var count = new int[(int)image.VoxelCount];
        var g = mask.Geometry;
        var (lo, hi) = Bounds(mask, occupancy, image);
        var toImage = image.PhysicalToIndexMatrix * g.IndexToPhysicalMatrix;
        var offset = image.PhysicalToIndex(g.OriginMm);
        var m = mask.Voxels;
        for (int k = lo.K; k <= hi.K; k++)
            for (int j = lo.J; j <= hi.J; j++)
                for (int i = lo.I; i <= hi.I; i++)
                {
                    var c = offset + toImage * new Vec3(i, j, k);
                    int x = (int)Math.Floor(c.X + 0.5), y = (int)Math.Floor(c.Y + 0.5), z = (int)Math.Floor(c.Z + 0.5);
                    if ((uint)x >= (uint)image.Size.X || (uint)y >= (uint)image.Size.Y || (uint)z >= (uint)image.Size.Z) continue;
                    int o = g.Size.X * (j + g.Size.Y * k) + i, a = x + image.Size.X * (y + image.Size.Y * z);
                    sum[a] += occupancy?.Voxels[o] ?? (m[o] != 0 ? 1f : 0f);
                    count[a]++;
                }
        return Select(sum, count, minFraction);
    }

    /// <summary>
    /// Image voxels whose fraction reaches <paramref name="minFraction"/>; when fewer than <see cref="MinSamples"/> do,
    /// the <see cref="MinSamples"/> fullest voxels (ties by index) so a small lesion still has a sample.
    /// </summary>
    private static byte[] Select(float[] sum, int[] count, double minFraction)
    {
        var selected = new byte[sum.Length];
        var touched = new List<(float Fraction, int Index)>();
        int reached = 0;
        for (int a = 0; a < selected.Length; a++)
        {
            if (count[a] == 0 || sum[a] <= 0) continue;
            float fraction = sum[a] / count[a];
            touched.Add((fraction, a));
            if (fraction >= minFraction - 1e-4) { selected[a] = 1; reached++; }
        }
        if (reached >= MinSamples) return selected;
        touched.Sort((x, y) => x.Fraction != y.Fraction ? y.Fraction.CompareTo(x.Fraction) : x.Index.CompareTo(y.Index));
        for (int n = 0; n < Math.Min(MinSamples, touched.Count); n++) selected[touched[n].Index] = 1;
        return selected;
    }

    /// <summary>Index box of the lesion on the mask grid, widened by one image voxel so every image voxel it touches is fully counted.</summary>
    private static (VoxelIndex Lo, VoxelIndex Hi) Bounds(Volume<byte> mask, Volume<float>? occupancy, Geometry image)
    {
        var s = mask.Size;
        int x0 = s.X, y0 = s.Y, z0 = s.Z, x1 = -1, y1 = -1, z1 = -1;
        for (int o = 0; o < mask.Voxels.Length; o++)
        {
            if (mask.Voxels[o] == 0 && (occupancy is null || occupancy.Voxels[o] == 0)) continue;
            int i = o % s.X, j = o / s.X % s.Y, k = o / (s.X * s.Y);
            x0 = Math.Min(x0, i); x1 = Math.Max(x1, i); y0 = Math.Min(y0, j); y1 = Math.Max(y1, j); z0 = Math.Min(z0, k); z1 = Math.Max(z1, k);
        }
        var sp = image.SpacingMm;
        double reach = Math.Sqrt(sp.X * sp.X + sp.Y * sp.Y + sp.Z * sp.Z);
        var ms = mask.Geometry.SpacingMm;
        int wx = (int)Math.Ceiling(reach / ms.X), wy = (int)Math.Ceiling(reach / ms.Y), wz = (int)Math.Ceiling(reach / ms.Z);
        return (new VoxelIndex(Math.Max(0, x0 - wx), Math.Max(0, y0 - wy), Math.Max(0, z0 - wz)),
                new VoxelIndex(Math.Min(s.X - 1, x1 + wx), Math.Min(s.Y - 1, y1 + wy), Math.Min(s.Z - 1, z1 + wz)));
    }
}
