using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration;

/// <summary>
/// Brings a moving image or mask onto the fixed grid through a registration result: each fixed voxel
/// centre x takes the moving value at T(x) (the transform maps fixed → moving points, LPS mm).
/// </summary>
public static class Resampler
{
    /// <summary>Trilinear resampling; voxels that map outside the moving image get <paramref name="outsideValue"/>.</summary>
    public static Volume<float> Resample(Volume<float> moving, Geometry fixedGrid, ISpatialTransform transform, float outsideValue = 0,
        int maxThreads = -1)
    {
        ArgumentNullException.ThrowIfNull(moving);
        ArgumentNullException.ThrowIfNull(fixedGrid);
        ArgumentNullException.ThrowIfNull(transform);
        var result = new Volume<float>(fixedGrid);
        var interp = new LinearInterpolator(moving);
        var vox = result.Voxels;
        int nx = fixedGrid.Size.X, ny = fixedGrid.Size.Y;
        ParallelRange.For(fixedGrid.Size.Z * ny, 8, (_, start, end) =>
        {
            for (int row = start; row < end; row++)
            {
                int j = row % ny, k = row / ny;
                for (int i = 0; i < nx; i++)
                    vox[i + nx * row] = interp.TryEvaluate(transform.TransformPoint(fixedGrid.IndexToPhysical(i, j, k)), out double v)
                        ? (float)v : outsideValue;
            }
        }, maxThreads);
        return result;
    }

    /// <summary>Nearest-neighbour resampling of a label mask (labels are kept, never blended).</summary>
    public static Volume<byte> ResampleMask(Volume<byte> movingMask, Geometry fixedGrid, ISpatialTransform transform)
    {
        ArgumentNullException.ThrowIfNull(movingMask);
        ArgumentNullException.ThrowIfNull(fixedGrid);
        ArgumentNullException.ThrowIfNull(transform);
        var result = new Volume<byte>(fixedGrid);
        var g = movingMask.Geometry;
        for (int k = 0; k < fixedGrid.Size.Z; k++)
            for (int j = 0; j < fixedGrid.Size.Y; j++)
                for (int i = 0; i < fixedGrid.Size.X; i++)
                {
                    var c = g.PhysicalToIndex(transform.TransformPoint(fixedGrid.IndexToPhysical(i, j, k)));
                    int x = (int)Math.Round(c.X), y = (int)Math.Round(c.Y), z = (int)Math.Round(c.Z);
                    if (x < 0 || y < 0 || z < 0 || x >= g.Size.X || y >= g.Size.Y || z >= g.Size.Z) continue;
                    result[i, j, k] = movingMask[x, y, z];
                }
        return result;
    }
}
