using System.Runtime.CompilerServices;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>
/// Evaluates one output row from precomputed moving continuous indices. A point is inside the moving image
/// when each index lies in [−0.5, n−0.5] (the voxel-centre box grown by half a voxel, as ITK's interpolators
/// treat it); neighbours beyond the last voxel centre are clamped (linear) or mirrored (B-spline).
/// Points outside, or NaN, get the outside value.
/// </summary>
internal static class RowSampler
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Inside(double x, double y, double z, Size3 n) =>
        x >= -0.5 && y >= -0.5 && z >= -0.5 && x <= n.X - 0.5 && y <= n.Y - 0.5 && z <= n.Z - 0.5;

    public static void Nearest<T>(ReadOnlySpan<T> src, Size3 n, ReadOnlySpan<double> xs, ReadOnlySpan<double> ys,
        ReadOnlySpan<double> zs, Span<T> dst, T outside) where T : unmanaged
    {
        for (int i = 0; i < dst.Length; i++)
        {
            double x = xs[i], y = ys[i], z = zs[i];
            if (!Inside(x, y, z, n))
            {
                dst[i] = outside;
                continue;
            }
            int ix = Math.Min((int)Math.Floor(x + 0.5), n.X - 1);
            int iy = Math.Min((int)Math.Floor(y + 0.5), n.Y - 1);
            int iz = Math.Min((int)Math.Floor(z + 0.5), n.Z - 1);
            dst[i] = src[ix + n.X * (iy + n.Y * iz)];
        }
    }

    public static void Linear(ReadOnlySpan<float> src, Size3 n, ReadOnlySpan<double> xs, ReadOnlySpan<double> ys,
        ReadOnlySpan<double> zs, Span<float> dst, float outside)
    {
        int sy = n.X, sz = n.X * n.Y;
        for (int i = 0; i < dst.Length; i++)
        {
            double x = xs[i], y = ys[i], z = zs[i];
            if (!Inside(x, y, z, n))
            {
                dst[i] = outside;
                continue;
            }
            Axis(x, n.X, out int x0, out int dx, out double fx);
            Axis(y, n.Y, out int y0, out int dy, out double fy);
            Axis(z, n.Z, out int z0, out int dz, out double fz);
            int b = x0 + sy * y0 + sz * z0;
            int by = dy * sy, bz = dz * sz;
            double c00 = src[b] + fx * (src[b + dx] - src[b]);
            double c10 = src[b + by] + fx * (src[b + by + dx] - src[b + by]);
            double c01 = src[b + bz] + fx * (src[b + bz + dx] - src[b + bz]);
            double c11 = src[b + by + bz] + fx * (src[b + by + bz + dx] - src[b + by + bz]);
            double c0 = c00 + fy * (c10 - c00);
            double c1 = c01 + fy * (c11 - c01);
            dst[i] = (float)(c0 + fz * (c1 - c0));
        }
    }

    /// <summary>Lower neighbour, step to the upper neighbour (0 at the clamped border) and fraction.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Axis(double c, int n, out int lo, out int step, out double frac)
    {
        if (c <= 0)
        {
            lo = 0; step = 0; frac = 0;
            return;
        }
        if (c >= n - 1)
        {
            lo = n - 1; step = 0; frac = 0;
            return;
        }
        lo = (int)c;
        step = 1;
        frac = c - lo;
    }

    public static void CubicBSpline(ReadOnlySpan<double> coefficients, Size3 n, ReadOnlySpan<double> xs, ReadOnlySpan<double> ys,
        ReadOnlySpan<double> zs, Span<float> dst, float outside)
    {
        Span<int> ix = stackalloc int[4];
        Span<int> iy = stackalloc int[4];
        Span<int> iz = stackalloc int[4];
        Span<double> wx = stackalloc double[4];
        Span<double> wy = stackalloc double[4];
        Span<double> wz = stackalloc double[4];
        int sy = n.X, sz = n.X * n.Y;
        for (int i = 0; i < dst.Length; i++)
        {
            double x = xs[i], y = ys[i], z = zs[i];
            if (!Inside(x, y, z, n))
            {
                dst[i] = outside;
                continue;
            }
            BSplineKernel.Taps(x, n.X, ix, wx);
            BSplineKernel.Taps(y, n.Y, iy, wy);
            BSplineKernel.Taps(z, n.Z, iz, wz);
            double sum = 0;
            for (int c = 0; c < 4; c++)
            {
                double planeSum = 0;
                int zo = iz[c] * sz;
                for (int b = 0; b < 4; b++)
                {
                    int o = zo + iy[b] * sy;
                    double rowSum = wx[0] * coefficients[o + ix[0]] + wx[1] * coefficients[o + ix[1]]
                        + wx[2] * coefficients[o + ix[2]] + wx[3] * coefficients[o + ix[3]];
                    planeSum += wy[b] * rowSum;
                }
                sum += wz[c] * planeSum;
            }
            dst[i] = (float)sum;
        }
    }
}
