using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;

namespace Serimetry.Engine.Measures;

/// <summary>
/// Minimal mask helpers for the measures: nearest-neighbour transfer of a label mask onto another grid
/// through physical space, voxel lists, boundary voxels and patient-axis extents. Kept internal: general
/// resampling lives in engine/Imaging.
/// </summary>
internal static class MaskGrid
{
    /// <summary>
    /// The mask on <paramref name="target"/>'s grid: the same object when the grids are congruent, else a
    /// nearest-neighbour transfer (each target voxel takes the label of the source voxel containing its
    /// centre; outside the source grid is 0).
    /// </summary>
    public static Volume<byte> OnGrid(Volume<byte> mask, Geometry target) =>
        mask.Geometry.IsCongruentWith(target) ? mask : Resampler.ResampleMask(mask, target, null, MaskInterpolation.Nearest);

    /// <summary>Number of non-zero voxels.</summary>
    public static int Count(ReadOnlySpan<byte> mask)
    {
        int n = mask.Length - mask.Count((byte)0);
        return n;
    }

    /// <summary>Linear indices of the non-zero voxels, ascending.</summary>
    public static int[] Indices(Volume<byte> mask)
    {
        var v = mask.Voxels;
        var list = new int[Count(v)];
        int n = 0;
        for (int i = 0; i < v.Length; i++)
            if (v[i] != 0) list[n++] = i;
        return list;
    }

    /// <summary>Physical centres (LPS mm) of mask voxels with at least one of their six face neighbours outside the mask or the grid.</summary>
    public static List<Vec3> BoundaryCentres(Volume<byte> mask)
    {
        var s = mask.Size;
        var v = mask.Voxels;
        var points = new List<Vec3>();
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    int o = i + s.X * (j + s.Y * k);
                    if (v[o] == 0) continue;
                    bool edge = i == 0 || j == 0 || k == 0 || i == s.X - 1 || j == s.Y - 1 || k == s.Z - 1
                        || v[o - 1] == 0 || v[o + 1] == 0 || v[o - s.X] == 0 || v[o + s.X] == 0
                        || v[o - s.X * s.Y] == 0 || v[o + s.X * s.Y] == 0;
                    if (edge) points.Add(mask.Geometry.IndexToPhysical(i, j, k));
                }
        return points;
    }

    /// <summary>
    /// Extents (mm) of the union of the mask's voxel boxes along the patient axes, as (LR, AP, CC) =
    /// (x, y, z of LPS). Along axis a: max − min of the voxel-centre projections plus the projected width
    /// of one voxel box, Σ_c |D[a,c]|·s_c, which is exact for the union of boxes.
    /// </summary>
    public static Vec3 PatientExtentsMm(Volume<byte> mask)
    {
        var g = mask.Geometry;
        var s = mask.Size;
        var v = mask.Voxels;
        double minX = double.MaxValue, minY = double.MaxValue, minZ = double.MaxValue;
        double maxX = double.MinValue, maxY = double.MinValue, maxZ = double.MinValue;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    if (v[i + s.X * (j + s.Y * k)] == 0) continue;
                    Vec3 p = g.IndexToPhysical(i, j, k);
                    minX = Math.Min(minX, p.X); maxX = Math.Max(maxX, p.X);
                    minY = Math.Min(minY, p.Y); maxY = Math.Max(maxY, p.Y);
                    minZ = Math.Min(minZ, p.Z); maxZ = Math.Max(maxZ, p.Z);
                }
        if (minX > maxX) return Vec3.Zero;
        Mat3 m = g.IndexToPhysicalMatrix;
        double wx = Math.Abs(m.M00) + Math.Abs(m.M01) + Math.Abs(m.M02);
        double wy = Math.Abs(m.M10) + Math.Abs(m.M11) + Math.Abs(m.M12);
        double wz = Math.Abs(m.M20) + Math.Abs(m.M21) + Math.Abs(m.M22);
        return new Vec3(maxX - minX + wx, maxY - minY + wy, maxZ - minZ + wz);
    }
}
