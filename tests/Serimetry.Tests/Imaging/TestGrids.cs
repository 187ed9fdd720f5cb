using Serimetry.Engine.Core;

namespace Serimetry.Tests.Imaging;

/// <summary>Grids and volumes shared by the imaging and NIfTI tests.</summary>
internal static class TestGrids
{
    /// <summary>Rotation Rz(az)·Ry(ay)·Rx(ax), angles in radians.</summary>
    public static Mat3 Rotation(double ax, double ay, double az)
    {
        var rx = new Mat3(1, 0, 0, 0, Math.Cos(ax), -Math.Sin(ax), 0, Math.Sin(ax), Math.Cos(ax));
        var ry = new Mat3(Math.Cos(ay), 0, Math.Sin(ay), 0, 1, 0, -Math.Sin(ay), 0, Math.Cos(ay));
        var rz = new Mat3(Math.Cos(az), -Math.Sin(az), 0, Math.Sin(az), Math.Cos(az), 0, 0, 0, 1);
        return rz * ry * rx;
    }

    /// <summary>An oblique, anisotropic grid (rotated about all three axes).</summary>
    public static Geometry Oblique(Size3 size, bool leftHanded = false)
    {
        var dir = Rotation(0.21, -0.13, 0.37);
        if (leftHanded) dir = dir * Mat3.Diagonal(new Vec3(1, 1, -1));
        return new Geometry(size, new Vec3(0.6, 0.75, 2.5), new Vec3(-41.25, 17.5, -8.125), dir);
    }

    public static Volume<float> Random(Geometry g, int seed, float scale = 1000f)
    {
        var rng = new Random(seed);
        var v = new Volume<float>(g);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = (float)(rng.NextDouble() * scale);
        return v;
    }

    /// <summary>A volume holding f(LPS point of each voxel centre).</summary>
    public static Volume<float> FromFunction(Geometry g, Func<Vec3, double> f)
    {
        var v = new Volume<float>(g);
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    v[i, j, k] = (float)f(g.IndexToPhysical(i, j, k));
        return v;
    }

    /// <summary>A binary ball of radius <paramref name="radiusMm"/> around the grid centre.</summary>
    public static Volume<byte> Ball(Geometry g, double radiusMm, byte label = 1)
    {
        var m = new Volume<byte>(g);
        var c = g.CenterMm;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    if ((g.IndexToPhysical(i, j, k) - c).Norm <= radiusMm) m[i, j, k] = label;
        return m;
    }

    public static long CountNonZero(Volume<byte> m)
    {
        long n = 0;
        foreach (var b in m.Voxels) if (b != 0) n++;
        return n;
    }
}
