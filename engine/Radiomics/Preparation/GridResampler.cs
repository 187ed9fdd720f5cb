using Serimetry.Engine.Core;

namespace Serimetry.Engine.Radiomics.Preparation;

/// <summary>
/// A small internal resampler for the radiomics chain only: IBSI "align grid centres" (IBSI reference
/// manual 2.4): the new grid has n_b = ⌈n_a s_a / s_b⌉ voxels per axis and shares the centre of the old
/// grid. Samples outside the old grid take the nearest edge value.
/// </summary>
internal static class GridResampler
{
    /// <summary>The new grid for the requested spacing (null entries keep the axis).</summary>
    public static Geometry AlignedGrid(Geometry g, double?[] spacingMm)
    {
        if (spacingMm.Length != 3)
            throw new InvalidParameterException($"resampling spacing has {spacingMm.Length} entries; expected 3 (x, y, z)", "resampling.spacingMm");
        double[] sa = [g.SpacingMm.X, g.SpacingMm.Y, g.SpacingMm.Z];
        int[] na = [g.Size.X, g.Size.Y, g.Size.Z];
        var sb = new double[3];
        var nb = new int[3];
        var c0 = new double[3];
        for (int a = 0; a < 3; a++)
        {
            double s = spacingMm[a] ?? sa[a];
            if (!(s > 0) || !double.IsFinite(s))
                throw new InvalidParameterException($"resampling spacing {s} mm on axis {a} must be positive", "resampling.spacingMm");
            sb[a] = s;
            nb[a] = Math.Max(1, (int)Math.Ceiling(na[a] * sa[a] / s - 1e-9));
            // Continuous old index of new voxel 0 so that both grid centres coincide.
            c0[a] = 0.5 * ((na[a] - 1) - (nb[a] - 1) * s / sa[a]);
        }
        var size = new Size3(nb[0], nb[1], nb[2]);
        Limits.CheckSize(size, "resampled radiomics grid");
        return g.With(size: size, spacingMm: new Vec3(sb[0], sb[1], sb[2]),
            originMm: g.IndexToPhysical(new Vec3(c0[0], c0[1], c0[2])));
    }

    /// <summary>Samples <paramref name="source"/> (on grid <paramref name="from"/>) at every voxel of <paramref name="to"/>.</summary>
    public static double[] Resample(ReadOnlySpan<double> source, Geometry from, Geometry to, InterpolationMethod method)
    {
        var result = new double[checked((int)to.VoxelCount)];
        double rx = to.SpacingMm.X / from.SpacingMm.X, ry = to.SpacingMm.Y / from.SpacingMm.Y, rz = to.SpacingMm.Z / from.SpacingMm.Z;
        Vec3 c0 = from.PhysicalToIndex(to.OriginMm);
        int nx = from.Size.X, ny = from.Size.Y, nz = from.Size.Z;
        int n = 0;
        for (int k = 0; k < to.Size.Z; k++)
        for (int j = 0; j < to.Size.Y; j++)
        for (int i = 0; i < to.Size.X; i++)
        {
            double x = Math.Clamp(c0.X + i * rx, 0, nx - 1);
            double y = Math.Clamp(c0.Y + j * ry, 0, ny - 1);
            double z = Math.Clamp(c0.Z + k * rz, 0, nz - 1);
            result[n++] = method == InterpolationMethod.Nearest
                ? source[(int)Math.Round(x) + nx * ((int)Math.Round(y) + ny * (int)Math.Round(z))]
                : Trilinear(source, nx, ny, nz, x, y, z);
        }
        return result;
    }

    private static double Trilinear(ReadOnlySpan<double> s, int nx, int ny, int nz, double x, double y, double z)
    {
        int x0 = Math.Min((int)x, nx - 1), y0 = Math.Min((int)y, ny - 1), z0 = Math.Min((int)z, nz - 1);
        int x1 = Math.Min(x0 + 1, nx - 1), y1 = Math.Min(y0 + 1, ny - 1), z1 = Math.Min(z0 + 1, nz - 1);
        double fx = x - x0, fy = y - y0, fz = z - z0;
        double c00 = Lerp(s[x0 + nx * (y0 + ny * z0)], s[x1 + nx * (y0 + ny * z0)], fx);
        double c10 = Lerp(s[x0 + nx * (y1 + ny * z0)], s[x1 + nx * (y1 + ny * z0)], fx);
        double c01 = Lerp(s[x0 + nx * (y0 + ny * z1)], s[x1 + nx * (y0 + ny * z1)], fx);
        double c11 = Lerp(s[x0 + nx * (y1 + ny * z1)], s[x1 + nx * (y1 + ny * z1)], fx);
        return Lerp(Lerp(c00, c10, fy), Lerp(c01, c11, fy), fz);
    }

    private static double Lerp(double a, double b, double f) => f == 0 ? a : a + (b - a) * f;
}
