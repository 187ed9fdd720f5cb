using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// Moves an occupancy volume (0…255 = fraction 0…1 of a voxel inside) onto a target grid through physical
/// space. When both grids share direction and spacing and their origins differ by whole voxels the voxels are
/// copied (inside ⇔ occupancy ≥ 128). Otherwise each target voxel is inside when its partial volume is ≥ 0.5:
/// the mean of the occupancy, interpolated trilinearly (0 outside the source), over n_x·n_y·n_z sub-points
/// evenly spread in the voxel, n_a = ⌈target spacing_a / finest source spacing⌉ capped at 4 (docs/masks.md).
/// </summary>
internal static class MaskTransfer
{
    private const int MaxSubSamples = 4;

    public static Volume<byte> ToGrid(Volume<byte> source, Geometry target, out bool aligned)
    {
        var result = new Volume<byte>(target);
        aligned = TryCopyAligned(source, result);
        if (!aligned) Resample(source, result);
        return result;
    }

    private static bool TryCopyAligned(Volume<byte> src, Volume<byte> dst)
    {
        Geometry s = src.Geometry, t = dst.Geometry;
        if (s.Direction.MaxAbsDifference(t.Direction) > 1e-4 || (s.SpacingMm - t.SpacingMm).Norm > 1e-4 * t.SpacingMm.Norm) return false;
        var o = t.PhysicalToIndex(s.OriginMm);
        int ox = (int)Math.Round(o.X), oy = (int)Math.Round(o.Y), oz = (int)Math.Round(o.Z);
        if (Math.Abs(o.X - ox) > 1e-3 || Math.Abs(o.Y - oy) > 1e-3 || Math.Abs(o.Z - oz) > 1e-3) return false;
        var ss = src.Size;
        var ts = t.Size;
        for (int k = 0; k < ss.Z; k++)
        {
            int tk = k + oz;
            if (tk < 0 || tk >= ts.Z) continue;
            for (int j = 0; j < ss.Y; j++)
            {
                int tj = j + oy;
                if (tj < 0 || tj >= ts.Y) continue;
                var row = src.Voxels.AsSpan(src.LinearIndex(0, j, k), ss.X);
                for (int i = 0; i < ss.X; i++)
                {
                    int ti = i + ox;
                    if (ti >= 0 && ti < ts.X && row[i] >= 128) dst.Voxels[dst.LinearIndex(ti, tj, tk)] = 1;
                }
            }
        }
        return true;
    }

    private static void Resample(Volume<byte> src, Volume<byte> dst)
    {
        Geometry s = src.Geometry, t = dst.Geometry;
        if (Bounds(src) is not var (lo, hi)) return;
        var (tlo, thi) = TargetBox(s, t, lo, hi);
        if (tlo.I > thi.I || tlo.J > thi.J || tlo.K > thi.K) return;
        Mat3 a = s.PhysicalToIndexMatrix * t.IndexToPhysicalMatrix;
        Vec3 b = s.PhysicalToIndex(t.OriginMm);
        double finest = Math.Min(s.SpacingMm.X, Math.Min(s.SpacingMm.Y, s.SpacingMm.Z));
        int Sub(double spacing) => Math.Clamp((int)Math.Ceiling(spacing / finest - 1e-9), 1, MaxSubSamples);
        int nx = Sub(t.SpacingMm.X), ny = Sub(t.SpacingMm.Y), nz = Sub(t.SpacingMm.Z);
        double total = nx * ny * nz * 255.0;
        ParallelRange.For(thi.K - tlo.K + 1, 1, (_, start, end) =>
        {
            for (int k = tlo.K + start; k < tlo.K + end; k++)
                for (int j = tlo.J; j <= thi.J; j++)
                    for (int i = tlo.I; i <= thi.I; i++)
                    {
                        double sum = 0;
                        for (int c = 0; c < nz; c++)
                            for (int r = 0; r < ny; r++)
                                for (int q = 0; q < nx; q++)
                                {
                                    var p = new Vec3(i + (q + 0.5) / nx - 0.5, j + (r + 0.5) / ny - 0.5, k + (c + 0.5) / nz - 0.5);
                                    sum += Trilinear(src, a * p + b);
                                }
                        if (sum >= 0.5 * total) dst.Voxels[dst.LinearIndex(i, j, k)] = 1;
                    }
        });
    }

    /// <summary>Trilinear interpolation of the occupancy at a continuous index, 0 outside the grid.</summary>
    private static double Trilinear(Volume<byte> v, Vec3 c)
    {
        var size = v.Size;
        double fx = Math.Floor(c.X), fy = Math.Floor(c.Y), fz = Math.Floor(c.Z);
        if (fx < -1 || fy < -1 || fz < -1 || fx >= size.X || fy >= size.Y || fz >= size.Z) return 0;
        int x0 = (int)fx, y0 = (int)fy, z0 = (int)fz;
        double wx = c.X - fx, wy = c.Y - fy, wz = c.Z - fz;
        double sum = 0;
        for (int dz = 0; dz < 2; dz++)
        {
            int z = z0 + dz;
            if (z < 0 || z >= size.Z) continue;
            double w2 = dz == 0 ? 1 - wz : wz;
            for (int dy = 0; dy < 2; dy++)
            {
                int y = y0 + dy;
                if (y < 0 || y >= size.Y) continue;
                double w1 = w2 * (dy == 0 ? 1 - wy : wy);
                int row = size.X * (y + size.Y * z);
                if (x0 >= 0) sum += w1 * (1 - wx) * v.Voxels[row + x0];
                if (x0 + 1 < size.X) sum += w1 * wx * v.Voxels[row + x0 + 1];
            }
        }
        return sum;
    }

    /// <summary>Index box of the non-zero voxels, or null when there are none.</summary>
    private static (VoxelIndex Lo, VoxelIndex Hi)? Bounds(Volume<byte> v)
    {
        var s = v.Size;
        int x0 = s.X, y0 = s.Y, z0 = s.Z, x1 = -1, y1 = -1, z1 = -1;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
            {
                var row = v.Voxels.AsSpan(v.LinearIndex(0, j, k), s.X);
                int first = row.IndexOfAnyExcept((byte)0);
                if (first < 0) continue;
                int last = row.LastIndexOfAnyExcept((byte)0);
                x0 = Math.Min(x0, first); x1 = Math.Max(x1, last);
                y0 = Math.Min(y0, j); y1 = Math.Max(y1, j);
                z0 = Math.Min(z0, k); z1 = Math.Max(z1, k);
            }
        return x1 < 0 ? null : (new VoxelIndex(x0, y0, z0), new VoxelIndex(x1, y1, z1));
    }

    /// <summary>The target index box covering the source box grown by one voxel (interpolation support).</summary>
    private static (VoxelIndex Lo, VoxelIndex Hi) TargetBox(Geometry s, Geometry t, VoxelIndex lo, VoxelIndex hi)
    {
        double x0 = double.MaxValue, y0 = double.MaxValue, z0 = double.MaxValue, x1 = double.MinValue, y1 = double.MinValue, z1 = double.MinValue;
        for (int c = 0; c < 8; c++)
        {
            var p = new Vec3((c & 1) == 0 ? lo.I - 1 : hi.I + 1, (c & 2) == 0 ? lo.J - 1 : hi.J + 1, (c & 4) == 0 ? lo.K - 1 : hi.K + 1);
            var q = t.PhysicalToIndex(s.IndexToPhysical(p));
            x0 = Math.Min(x0, q.X); x1 = Math.Max(x1, q.X);
            y0 = Math.Min(y0, q.Y); y1 = Math.Max(y1, q.Y);
            z0 = Math.Min(z0, q.Z); z1 = Math.Max(z1, q.Z);
        }
        var size = t.Size;
        static int Lo(double v, int n) => (int)Math.Clamp(Math.Floor(v), 0, n);
        static int Hi(double v, int n) => (int)Math.Clamp(Math.Ceiling(v), -1, n - 1);
        return (new VoxelIndex(Lo(x0, size.X), Lo(y0, size.Y), Lo(z0, size.Z)), new VoxelIndex(Hi(x1, size.X), Hi(y1, size.Y), Hi(z1, size.Z)));
    }
}
