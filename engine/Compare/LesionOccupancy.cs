using Serimetry.Engine.Core;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Partial-volume occupancy of a lesion outline on the T2w grid (docs/measures.md, "Volumes and partial volume"):
/// the fraction of each voxel filled by lesion, from a linear mixing model of T2w signal in the boundary band.
/// Voxels of the outline away from its edge count 1, voxels away from it 0. A band voxel (one whose 26
/// neighbours are not all on its side of the outline) holds f = (T − T_bg)/(T_lesion − T_bg), clamped to [0, 1]:
/// T_lesion is the mean T2w of the outline's core (outline voxels outside the band), T_bg the mean T2w of the
/// background ring (outside voxels just beyond the band) within <see cref="WindowMm"/> of the voxel, so the
/// background is local (peripheral or transition zone, bias field, texture). T2w is used alone because it is the
/// channel sampled on this grid; ADC resampled from its coarser grid carries no sub-voxel information here.
/// </summary>
internal static class LesionOccupancy
{
    /// <summary>Half-width (mm, per index axis, at least one voxel) of the window that gives each band voxel its local background.</summary>
    internal const double WindowMm = 3.0;

    /// <summary>Lesion and local background must differ by this many SDs of the core signal, else no fraction is estimated.</summary>
    internal const double MinContrastSds = 3.0;

    /// <summary>Core voxels needed to estimate the pure lesion signal.</summary>
    internal const int MinCoreVoxels = 8;

    /// <summary>
    /// The occupancy map (same grid as <paramref name="lesion"/>), or null with a reason when the lesion has too
    /// small a core or too little T2w contrast against its surroundings (the binary outline then stands).
    /// Band voxels are considered only inside <paramref name="region"/> (e.g. the dilated gland).
    /// </summary>
    public static Volume<float>? Estimate(Volume<float> t2w, Volume<byte> lesion, Volume<byte> region, out string? reason)
    {
        t2w.Geometry.RequireCongruent(lesion.Geometry, "T2w and lesion outline");
        lesion.Geometry.RequireCongruent(region.Geometry, "lesion outline and region");
        reason = null;
        // Everything happens within three voxel steps of the outline (band one step, background ring two), so work on
        // that box only and leave the rest of the grid at 0.
        if (!Box(lesion.Voxels, lesion.Size, 3, out var lo, out var box)) { reason = "the lesion outline is empty"; return null; }
        var fractions = EstimateInBox(Crop(t2w.Voxels, lesion.Size, lo, box), Crop(lesion.Voxels, lesion.Size, lo, box),
            Crop(region.Voxels, lesion.Size, lo, box), box, lesion.Geometry.SpacingMm, out reason);
        if (fractions is null) return null;
        var occupancy = new Volume<float>(lesion.Geometry);
        Paste(fractions, box, occupancy.Voxels, lesion.Size, lo);
        return occupancy;
    }

    private static float[]? EstimateInBox(float[] t, byte[] inside, byte[] region, Size3 size, Vec3 spacing, out string? reason)
    {
        reason = null;
        var grown = StepDilate(inside, size);
        var shrunkOutside = StepDilate(Complement(inside), size);
        var ring = StepDilate(grown, size);
        for (int n = 0; n < ring.Length; n++)
            ring[n] = (byte)(ring[n] != 0 && grown[n] == 0 && region[n] != 0 && float.IsFinite(t[n]) ? 1 : 0);
        // Core: outline voxels with no outside 26-neighbour; a lesion only two slices thick has none, so then the
        // voxels with no outside neighbour in their own slice (their through-plane partial volume is small near the axis).
        var (core, coreSum, coreSq) = CoreStatistics(t, inside, shrunkOutside);
        if (core < MinCoreVoxels) (core, coreSum, coreSq) = CoreStatistics(t, inside, StepDilate(Complement(inside), size, throughPlane: false));
        if (core < MinCoreVoxels) { reason = $"the lesion core has {core} voxels (< {MinCoreVoxels})"; return null; }
        double lesionMean = coreSum / core;
        double sd = Math.Sqrt(Math.Max(0, coreSq / core - lesionMean * lesionMean));
        var f = new float[t.Length];
        var layers = new Layers(inside, grown, shrunkOutside, ring, region, size);
        var (estimated, lowContrast) = Fill(f, t, layers, lesionMean, MinContrastSds * sd, WindowVoxels(spacing));
        if (estimated == 0) { reason = "lesion and surrounding tissue differ too little on T2w for a partial-volume estimate"; return null; }
        if (lowContrast > estimated) { reason = $"too little T2w contrast at {lowContrast} of {lowContrast + estimated} boundary voxels"; return null; }
        return f;
    }

    /// <summary>Index box of the non-zero voxels widened by <paramref name="margin"/> (clamped to the grid); false when there are none.</summary>
    private static bool Box(byte[] mask, Size3 size, int margin, out VoxelIndex lo, out Size3 box)
    {
        int x0 = int.MaxValue, y0 = int.MaxValue, z0 = int.MaxValue, x1 = -1, y1 = -1, z1 = -1;
        for (int k = 0, n = 0; k < size.Z; k++)
            for (int j = 0; j < size.Y; j++)
                for (int i = 0; i < size.X; i++, n++)
                {
                    if (mask[n] == 0) continue;
                    x0 = Math.Min(x0, i); x1 = Math.Max(x1, i); y0 = Math.Min(y0, j); y1 = Math.Max(y1, j); z0 = Math.Min(z0, k); z1 = Math.Max(z1, k);
                }
        lo = new VoxelIndex(Math.Max(0, x0 - margin), Math.Max(0, y0 - margin), Math.Max(0, z0 - margin));
        box = new Size3(Math.Min(size.X - 1, x1 + margin) - lo.I + 1, Math.Min(size.Y - 1, y1 + margin) - lo.J + 1, Math.Min(size.Z - 1, z1 + margin) - lo.K + 1);
        return x1 >= 0;
    }

    private static T[] Crop<T>(T[] source, Size3 size, VoxelIndex lo, Size3 box)
    {
        var result = new T[box.X * box.Y * box.Z];
        for (int k = 0; k < box.Z; k++)
            for (int j = 0; j < box.Y; j++)
                Array.Copy(source, lo.I + size.X * (lo.J + j + size.Y * (lo.K + k)), result, box.X * (j + box.Y * k), box.X);
        return result;
    }

    private static void Paste(float[] source, Size3 box, float[] target, Size3 size, VoxelIndex lo)
    {
        for (int k = 0; k < box.Z; k++)
            for (int j = 0; j < box.Y; j++)
                Array.Copy(source, box.X * (j + box.Y * k), target, lo.I + size.X * (lo.J + j + size.Y * (lo.K + k)), box.X);
    }

    /// <summary>The outline and the masks around it, on one grid: inside, one step out, one step in from outside, the background ring, the allowed region.</summary>
    private readonly record struct Layers(byte[] Inside, byte[] Grown, byte[] NearOutside, byte[] Ring, byte[] Region, Size3 Size);

    /// <summary>Writes every voxel's fraction; returns how many band voxels were estimated and how many kept their binary label for lack of contrast.</summary>
    private static (int Estimated, int LowContrast) Fill(float[] f, float[] t, Layers m, double lesionMean, double minContrast, Size3 window)
    {
        int estimated = 0, lowContrast = 0;
        for (int n = 0; n < f.Length; n++)
        {
            bool isInside = m.Inside[n] != 0;
            bool band = isInside ? m.NearOutside[n] != 0 : m.Grown[n] != 0 && m.Region[n] != 0;
            if (!band) { f[n] = isInside ? 1f : 0f; continue; }
            double background = LocalMean(t, m.Ring, m.Size, n, window);
            double contrast = lesionMean - background;
            if (!double.IsFinite(background) || !float.IsFinite(t[n]) || Math.Abs(contrast) < minContrast)
            {
                f[n] = isInside ? 1f : 0f;
                lowContrast++;
                continue;
            }
            f[n] = (float)Math.Clamp((t[n] - background) / contrast, 0, 1);
            estimated++;
        }
        return (estimated, lowContrast);
    }

    private static Size3 WindowVoxels(Vec3 spacing) => new(
        Math.Max(1, (int)Math.Round(WindowMm / spacing.X)),
        Math.Max(1, (int)Math.Round(WindowMm / spacing.Y)),
        Math.Max(1, (int)Math.Round(WindowMm / spacing.Z)));

    /// <summary>Mean of <paramref name="t"/> over ring voxels in the window around voxel n; NaN when none.</summary>
    private static double LocalMean(float[] t, byte[] ring, Size3 size, int n, Size3 w)
    {
        int nx = size.X, nxy = nx * size.Y, i = n % nx, j = n / nx % size.Y, k = n / nxy;
        double sum = 0;
        int count = 0;
        for (int z = Math.Max(0, k - w.Z); z <= Math.Min(size.Z - 1, k + w.Z); z++)
            for (int y = Math.Max(0, j - w.Y); y <= Math.Min(size.Y - 1, j + w.Y); y++)
            {
                int row = y * nx + z * nxy;
                for (int x = Math.Max(0, i - w.X); x <= Math.Min(nx - 1, i + w.X); x++)
                    if (ring[row + x] != 0) { sum += t[row + x]; count++; }
            }
        return count > 0 ? sum / count : double.NaN;
    }

    /// <summary>Count, sum and sum of squares of T2w over outline voxels not flagged in <paramref name="nearOutside"/>.</summary>
    private static (int Count, double Sum, double SumSq) CoreStatistics(float[] t, byte[] inside, byte[] nearOutside)
    {
        int count = 0;
        double sum = 0, sq = 0;
        for (int n = 0; n < t.Length; n++)
        {
            if (inside[n] == 0 || nearOutside[n] != 0 || !float.IsFinite(t[n])) continue;
            count++;
            sum += t[n];
            sq += (double)t[n] * t[n];
        }
        return (count, sum, sq);
    }

    private static byte[] Complement(byte[] mask)
    {
        var r = new byte[mask.Length];
        for (int n = 0; n < r.Length; n++) r[n] = mask[n] == 0 ? (byte)1 : (byte)0;
        return r;
    }

    /// <summary>
    /// One step of 26-neighbour dilation in index space (separable: ±1 along each axis in turn), or of 8-neighbour
    /// dilation within each slice when <paramref name="throughPlane"/> is false.
    /// </summary>
    internal static byte[] StepDilate(byte[] mask, Size3 size, bool throughPlane = true)
    {
        var a = (byte[])mask.Clone();
        var b = new byte[mask.Length];
        int nx = size.X, nxy = nx * size.Y;
        foreach (var (stride, extent) in throughPlane ? new[] { (1, size.X), (nx, size.Y), (nxy, size.Z) } : new[] { (1, size.X), (nx, size.Y) })
        {
            for (int n = 0; n < a.Length; n++)
            {
                int pos = n / stride % extent;
                byte v = a[n];
                if (pos > 0) v |= a[n - stride];
                if (pos < extent - 1) v |= a[n + stride];
                b[n] = v != 0 ? (byte)1 : (byte)0;
            }
            (a, b) = (b, a);
        }
        return a;
    }
}
