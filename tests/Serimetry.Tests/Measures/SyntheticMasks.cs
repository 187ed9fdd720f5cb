using Serimetry.Engine.Core;

namespace Serimetry.Tests.Measures;

/// <summary>Analytic shapes voxelised by the voxel-centre rule, for measures with known truth.</summary>
internal static class SyntheticMasks
{
    /// <summary>A grid of the given size and spacing whose centre sits at <paramref name="centreMm"/>.</summary>
    public static Geometry Centred(Size3 size, Vec3 spacingMm, Mat3 direction, Vec3 centreMm)
    {
        var g = new Geometry(size, spacingMm, Vec3.Zero, direction);
        return g.With(originMm: centreMm - (g.CenterMm - g.OriginMm));
    }

    /// <summary>A rotation by <paramref name="degrees"/> about a unit axis (Rodrigues).</summary>
    public static Mat3 Rotation(Vec3 axis, double degrees)
    {
        var u = axis.Normalized();
        double t = degrees * Math.PI / 180, c = Math.Cos(t), s = Math.Sin(t), C = 1 - c;
        return new Mat3(
            c + u.X * u.X * C, u.X * u.Y * C - u.Z * s, u.X * u.Z * C + u.Y * s,
            u.Y * u.X * C + u.Z * s, c + u.Y * u.Y * C, u.Y * u.Z * C - u.X * s,
            u.Z * u.X * C - u.Y * s, u.Z * u.Y * C + u.X * s, c + u.Z * u.Z * C);
    }

    /// <summary>Voxels whose centre lies inside the patient-axis-aligned ellipsoid with semi-axes (LR, AP, CC) mm.</summary>
    public static Volume<byte> Ellipsoid(Geometry g, Vec3 centreMm, Vec3 semiAxesMm, byte label = 1)
    {
        var m = new Volume<byte>(g);
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    var d = g.IndexToPhysical(i, j, k) - centreMm;
                    double q = Sq(d.X / semiAxesMm.X) + Sq(d.Y / semiAxesMm.Y) + Sq(d.Z / semiAxesMm.Z);
                    if (q <= 1) m[i, j, k] = label;
                }
        return m;
    }

    /// <summary>A float image filled by a function of the physical point.</summary>
    public static Volume<float> Image(Geometry g, Func<Vec3, float> f)
    {
        var v = new Volume<float>(g);
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    v[i, j, k] = f(g.IndexToPhysical(i, j, k));
        return v;
    }

    private static double Sq(double x) => x * x;
}
