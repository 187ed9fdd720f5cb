using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration.Pyramid;

/// <summary>
/// Builds a coarser grid by integer shrink factors per axis; the new voxel centres sit at the centres of
/// the blocks of original voxels they replace, so the grid covers the same physical extent.
/// </summary>
internal static class Downsampler
{
    public static Geometry ShrinkGeometry(Geometry g, (int X, int Y, int Z) shrink)
    {
        var size = new Size3(Ceil(g.Size.X, shrink.X), Ceil(g.Size.Y, shrink.Y), Ceil(g.Size.Z, shrink.Z));
        var spacing = new Vec3(g.SpacingMm.X * shrink.X, g.SpacingMm.Y * shrink.Y, g.SpacingMm.Z * shrink.Z);
        var origin = g.IndexToPhysical(new Vec3((shrink.X - 1) / 2.0, (shrink.Y - 1) / 2.0, (shrink.Z - 1) / 2.0));
        return new Geometry(size, spacing, origin, g.Direction);
    }

    /// <summary>Resamples (trilinear) a smoothed image onto the shrunk grid.</summary>
    public static Volume<float> Shrink(Volume<float> smoothed, (int X, int Y, int Z) shrink)
    {
        if (shrink is (1, 1, 1)) return smoothed;
        var g = ShrinkGeometry(smoothed.Geometry, shrink);
        var result = new Volume<float>(g);
        var interp = new LinearInterpolator(smoothed);
        var vox = result.Voxels;
        int nx = g.Size.X, ny = g.Size.Y;
        ParallelRange.For(g.Size.Z * ny, 16, (_, start, end) =>
        {
            for (int row = start; row < end; row++)
            {
                int j = row % ny, k = row / ny;
                for (int i = 0; i < nx; i++)
                {
                    interp.TryEvaluate(g.IndexToPhysical(i, j, k), out double v);
                    vox[i + nx * row] = (float)v;
                }
            }
        });
        return result;
    }

    /// <summary>Resamples a mask onto the shrunk grid by nearest neighbour.</summary>
    public static Volume<byte> ShrinkMask(Volume<byte> mask, (int X, int Y, int Z) shrink)
    {
        if (shrink is (1, 1, 1)) return mask;
        var src = mask.Geometry;
        var g = ShrinkGeometry(src, shrink);
        var result = new Volume<byte>(g);
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    var c = src.PhysicalToIndex(g.IndexToPhysical(i, j, k));
                    int x = Math.Clamp((int)Math.Round(c.X), 0, src.Size.X - 1);
                    int y = Math.Clamp((int)Math.Round(c.Y), 0, src.Size.Y - 1);
                    int z = Math.Clamp((int)Math.Round(c.Z), 0, src.Size.Z - 1);
                    result[i, j, k] = mask[x, y, z];
                }
        return result;
    }

    private static int Ceil(int n, int f) => (n + f - 1) / f;
}
