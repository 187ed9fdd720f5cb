using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging.Morphology;

/// <summary>Binary mask operations in physical units (mm) on anisotropic grids.</summary>
public static class MaskOps
{
    /// <summary>Voxels within <paramref name="radiusMm"/> of the mask (Euclidean, voxel centres).</summary>
    public static Volume<byte> Dilate(Volume<byte> mask, double radiusMm)
    {
        var d2 = DistanceTransform.SquaredDistanceToMaskMm2(mask);
        float r2 = (float)(radiusMm * radiusMm) + 1e-4f;
        var result = mask.Like<byte>();
        var r = result.Voxels;
        for (int n = 0; n < r.Length; n++) r[n] = d2[n] <= r2 ? (byte)1 : (byte)0;
        return result;
    }

    /// <summary>
    /// Dilates by a box of ±<paramref name="marginMm"/> along each axis (separable running maximum, O(n) per axis):
    /// much faster than <see cref="Dilate"/> for large margins, used where a generous neighbourhood is all that
    /// matters (registration masks and crops).
    /// </summary>
    public static Volume<byte> DilateBox(Volume<byte> mask, double marginMm)
    {
        var size = mask.Size;
        var sp = mask.Geometry.SpacingMm;
        var cur = (byte[])mask.Voxels.Clone();
        for (int axis = 0; axis < 3; axis++)
        {
            int r = (int)Math.Floor(marginMm / sp[axis] + 1e-9);
            if (r <= 0 || size[axis] == 1) continue;
            cur = DilateAxis(cur, size, axis, r);
        }
        return new Volume<byte>(mask.Geometry, cur);
    }

    /// <summary>Per line: a voxel is set when a set voxel lies within r steps (forward and backward sweeps, O(n)).</summary>
    private static byte[] DilateAxis(byte[] src, Size3 size, int axis, int r)
    {
        var dst = new byte[src.Length];
        int stride = axis == 0 ? 1 : axis == 1 ? size.X : size.X * size.Y;
        int n = size[axis];
        int lines = src.Length / n;
        for (int l = 0; l < lines; l++)
        {
            int b = axis == 0 ? l * size.X : axis == 1 ? (l / size.X) * size.X * size.Y + l % size.X : l;
            int last = int.MinValue / 2;
            for (int t = 0; t < n; t++)
            {
                if (src[b + t * stride] != 0) last = t;
                if (t - last <= r) dst[b + t * stride] = 1;
            }
            last = int.MaxValue / 2;
            for (int t = n - 1; t >= 0; t--)
            {
                if (src[b + t * stride] != 0) last = t;
                if (last - t <= r) dst[b + t * stride] = 1;
            }
        }
        return dst;
    }

    /// <summary>Voxels of the mask farther than <paramref name="radiusMm"/> from any outside voxel.</summary>
    public static Volume<byte> Erode(Volume<byte> mask, double radiusMm)
    {
        var outside = mask.Like<byte>();
        var m = mask.Voxels;
        var o = outside.Voxels;
        for (int n = 0; n < m.Length; n++) o[n] = m[n] == 0 ? (byte)1 : (byte)0;
        var grown = Dilate(outside, radiusMm);
        var result = mask.Like<byte>();
        var g = grown.Voxels;
        var r = result.Voxels;
        for (int n = 0; n < r.Length; n++) r[n] = m[n] != 0 && g[n] == 0 ? (byte)1 : (byte)0;
        return result;
    }

    /// <summary>Binary mask of voxels equal to <paramref name="label"/> (or any non-zero value when label is null).</summary>
    public static Volume<byte> Binarize(Volume<byte> mask, byte? label = null)
    {
        var result = mask.Like<byte>();
        var m = mask.Voxels;
        var r = result.Voxels;
        for (int n = 0; n < m.Length; n++) r[n] = (label is null ? m[n] != 0 : m[n] == label) ? (byte)1 : (byte)0;
        return result;
    }

    /// <summary>Voxels set in both masks.</summary>
    public static Volume<byte> And(Volume<byte> a, Volume<byte> b)
    {
        a.Geometry.RequireCongruent(b.Geometry, "masks to intersect");
        var result = a.Like<byte>();
        for (int n = 0; n < a.Voxels.Length; n++) result.Voxels[n] = a.Voxels[n] != 0 && b.Voxels[n] != 0 ? (byte)1 : (byte)0;
        return result;
    }

    /// <summary>Voxels set in <paramref name="a"/> but not in <paramref name="b"/>.</summary>
    public static Volume<byte> Subtract(Volume<byte> a, Volume<byte> b)
    {
        a.Geometry.RequireCongruent(b.Geometry, "masks to subtract");
        var result = a.Like<byte>();
        for (int n = 0; n < a.Voxels.Length; n++) result.Voxels[n] = a.Voxels[n] != 0 && b.Voxels[n] == 0 ? (byte)1 : (byte)0;
        return result;
    }

    public static long Count(Volume<byte> mask)
    {
        long c = 0;
        foreach (var v in mask.Voxels) if (v != 0) c++;
        return c;
    }

    /// <summary>Dice coefficient 2|A∩B|/(|A|+|B|); 1 when both are empty.</summary>
    public static double Dice(Volume<byte> a, Volume<byte> b)
    {
        a.Geometry.RequireCongruent(b.Geometry, "masks to compare");
        long both = 0, na = 0, nb = 0;
        for (int n = 0; n < a.Voxels.Length; n++)
        {
            bool x = a.Voxels[n] != 0, y = b.Voxels[n] != 0;
            if (x) na++;
            if (y) nb++;
            if (x && y) both++;
        }
        return na + nb == 0 ? 1.0 : 2.0 * both / (na + nb);
    }

    /// <summary>Physical centroid (LPS mm) of the non-zero voxels, or null when the mask is empty.</summary>
    public static Vec3? CentroidMm(Volume<byte> mask)
    {
        var s = mask.Size;
        double si = 0, sj = 0, sk = 0;
        long c = 0;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
            {
                int row = mask.LinearIndex(0, j, k);
                for (int i = 0; i < s.X; i++)
                {
                    if (mask.Voxels[row + i] == 0) continue;
                    si += i; sj += j; sk += k; c++;
                }
            }
        return c == 0 ? null : mask.Geometry.IndexToPhysical(new Vec3(si / c, sj / c, sk / c));
    }

    /// <summary>
    /// The 6-connected components of the mask that share at least one voxel with <paramref name="seed"/>;
    /// when none does, the single largest component.
    /// </summary>
    public static Volume<byte> ComponentsTouching(Volume<byte> mask, Volume<byte> seed)
    {
        mask.Geometry.RequireCongruent(seed.Geometry, "mask and seed");
        var labels = ConnectedComponents.Label(mask, out var sizes);
        var keep = new bool[sizes.Length];
        bool any = false;
        for (int n = 0; n < labels.Length; n++)
            if (labels[n] > 0 && seed.Voxels[n] != 0) keep[labels[n]] = any = true;
        if (!any && sizes.Length > 1)
        {
            int best = 1;
            for (int l = 2; l < sizes.Length; l++) if (sizes[l] > sizes[best]) best = l;
            keep[best] = true;
        }
        var result = mask.Like<byte>();
        for (int n = 0; n < labels.Length; n++) result.Voxels[n] = labels[n] > 0 && keep[labels[n]] ? (byte)1 : (byte)0;
        return result;
    }

    /// <summary>Fills cavities: background voxels not 6-connected to the volume border become foreground.</summary>
    public static Volume<byte> FillHoles(Volume<byte> mask)
    {
        var background = mask.Like<byte>();
        for (int n = 0; n < mask.Voxels.Length; n++) background.Voxels[n] = mask.Voxels[n] == 0 ? (byte)1 : (byte)0;
        var labels = ConnectedComponents.Label(background, out var sizes);
        var outer = new bool[sizes.Length];
        var s = mask.Size;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    bool border = i == 0 || j == 0 || k == 0 || i == s.X - 1 || j == s.Y - 1 || k == s.Z - 1;
                    if (border) outer[labels[mask.LinearIndex(i, j, k)]] = true;
                }
        var result = mask.Like<byte>();
        for (int n = 0; n < labels.Length; n++)
            result.Voxels[n] = mask.Voxels[n] != 0 || (labels[n] > 0 && !outer[labels[n]]) ? (byte)1 : (byte)0;
        return result;
    }
}
