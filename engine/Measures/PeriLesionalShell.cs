using Serimetry.Engine.Core;

namespace Serimetry.Engine.Measures;

/// <summary>
/// The peri-lesional shell used by the conspicuity measures: voxels of the gland, outside the lesion,
/// whose centre lies within <c>d</c> mm (Euclidean, physical space) of some lesion voxel centre. Built by
/// stamping an ellipsoidal index-space structuring element (all offsets whose physical length is ≤ d,
/// so anisotropic and oblique grids are handled exactly) around every lesion voxel.
/// </summary>
internal static class PeriLesionalShell
{
    /// <summary>A byte mask (1 = shell) on the grid shared by <paramref name="lesion"/> and <paramref name="gland"/>.</summary>
    public static byte[] Build(Volume<byte> lesion, Volume<byte> gland, double distanceMm)
    {
        lesion.Geometry.RequireCongruent(gland.Geometry, "lesion and gland masks");
        var s = lesion.Size;
        var offsets = Offsets(lesion.Geometry, distanceMm);
        var l = lesion.Voxels;
        var shell = new byte[l.Length];
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    if (l[i + s.X * (j + s.Y * k)] == 0) continue;
                    foreach (var (di, dj, dk) in offsets)
                    {
                        int a = i + di, b = j + dj, c = k + dk;
                        if ((uint)a < (uint)s.X && (uint)b < (uint)s.Y && (uint)c < (uint)s.Z)
                            shell[a + s.X * (b + s.Y * c)] = 1;
                    }
                }
        var g = gland.Voxels;
        for (int o = 0; o < shell.Length; o++)
            if (l[o] != 0 || g[o] == 0) shell[o] = 0;
        return shell;
    }

    /// <summary>Index offsets whose physical length is at most <paramref name="distanceMm"/>.</summary>
    internal static List<(int, int, int)> Offsets(Geometry g, double distanceMm)
    {
        var m = g.IndexToPhysicalMatrix;
        // A step of one index along axis c moves spacing_c mm, so |offset_c| ≤ d / spacing_c bounds the search.
        int ri = (int)Math.Floor(distanceMm / g.SpacingMm.X), rj = (int)Math.Floor(distanceMm / g.SpacingMm.Y),
            rk = (int)Math.Floor(distanceMm / g.SpacingMm.Z);
        var list = new List<(int, int, int)>();
        for (int c = -rk; c <= rk; c++)
            for (int b = -rj; b <= rj; b++)
                for (int a = -ri; a <= ri; a++)
                    if ((m * new Vec3(a, b, c)).Norm <= distanceMm + 1e-9) list.Add((a, b, c));
        return list;
    }
}
