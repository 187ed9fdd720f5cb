using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>Mask helpers used by registration.</summary>
internal static class MaskOperations
{
    /// <summary>
    /// The index box [lo, hi] (inclusive) of the non-zero voxels grown by <paramref name="marginMm"/> and
    /// clipped to the grid; null when the mask is empty.
    /// </summary>
    public static (VoxelIndex Lo, VoxelIndex Hi)? BoundingBox(Volume<byte> mask, double marginMm)
    {
        var s = mask.Size;
        int x0 = int.MaxValue, y0 = int.MaxValue, z0 = int.MaxValue, x1 = -1, y1 = -1, z1 = -1;
        int idx = 0;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++, idx++)
                {
                    if (mask.Voxels[idx] == 0) continue;
                    x0 = Math.Min(x0, i); x1 = Math.Max(x1, i); y0 = Math.Min(y0, j); y1 = Math.Max(y1, j); z0 = Math.Min(z0, k); z1 = Math.Max(z1, k);
                }
        if (x1 < 0) return null;
        var sp = mask.Geometry.SpacingMm;
        int mx = (int)Math.Ceiling(marginMm / sp.X), my = (int)Math.Ceiling(marginMm / sp.Y), mz = (int)Math.Ceiling(marginMm / sp.Z);
        return (new VoxelIndex(Math.Max(0, x0 - mx), Math.Max(0, y0 - my), Math.Max(0, z0 - mz)),
                new VoxelIndex(Math.Min(s.X - 1, x1 + mx), Math.Min(s.Y - 1, y1 + my), Math.Min(s.Z - 1, z1 + mz)));
    }

    /// <summary>The sub-volume of voxels [lo, hi] (inclusive), with its geometry's origin at voxel lo.</summary>
    public static Volume<T> Crop<T>(Volume<T> image, VoxelIndex lo, VoxelIndex hi) where T : unmanaged
    {
        var size = new Size3(hi.I - lo.I + 1, hi.J - lo.J + 1, hi.K - lo.K + 1);
        if (size == image.Size) return image;
        var g = image.Geometry.With(size: size, originMm: image.Geometry.IndexToPhysical(lo.I, lo.J, lo.K));
        var result = new Volume<T>(g);
        for (int k = 0; k < size.Z; k++)
            for (int j = 0; j < size.Y; j++)
                image.Voxels.AsSpan(image.LinearIndex(lo.I, lo.J + j, lo.K + k), size.X)
                    .CopyTo(result.Voxels.AsSpan(result.LinearIndex(0, j, k), size.X));
        return result;
    }

    /// <summary>The part of <paramref name="mask"/> under <paramref name="subGrid"/>, a crop of the mask's own grid (as <see cref="Crop{T}"/> makes).</summary>
    public static Volume<byte> CropTo(Volume<byte> mask, Geometry subGrid)
    {
        var lo = mask.Geometry.PhysicalToIndex(subGrid.OriginMm);
        var l = new VoxelIndex((int)Math.Round(lo.X), (int)Math.Round(lo.Y), (int)Math.Round(lo.Z));
        var cropped = Crop(mask, l, new VoxelIndex(l.I + subGrid.Size.X - 1, l.J + subGrid.Size.Y - 1, l.K + subGrid.Size.Z - 1));
        subGrid.RequireCongruent(cropped.Geometry, "the cropped image and the cropped mask");
        return cropped;
    }

    /// <summary>Physical centroid (LPS mm) of the non-zero voxels.</summary>
    public static Vec3 Centroid(Volume<byte> mask)
    {
        double sx = 0, sy = 0, sz = 0;
        long n = 0;
        var s = mask.Size;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    if (mask[i, j, k] == 0) continue;
                    sx += i; sy += j; sz += k; n++;
                }
        return n == 0 ? mask.Geometry.CenterMm : mask.Geometry.IndexToPhysical(new Vec3(sx / n, sy / n, sz / n));
    }
}
