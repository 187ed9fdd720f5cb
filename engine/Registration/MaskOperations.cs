using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>Mask helpers used by registration.</summary>
internal static class MaskOperations
{
    /// <summary>Dilates by a box of ±<paramref name="marginMm"/> along each axis (separable running maximum).</summary>
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

    private static byte[] DilateAxis(byte[] src, Size3 size, int axis, int r)
    {
        var dst = new byte[src.Length];
        int stride = axis == 0 ? 1 : axis == 1 ? size.X : size.X * size.Y;
        int n = size[axis];
        for (int idx = 0; idx < src.Length; idx++)
        {
            int pos = idx / stride % n;
            int lo = Math.Max(0, pos - r), hi = Math.Min(n - 1, pos + r);
            int b = idx - pos * stride;
            byte m = 0;
            for (int t = lo; t <= hi && m == 0; t++) m = src[b + t * stride];
            dst[idx] = m != 0 ? (byte)1 : (byte)0;
        }
        return dst;
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
