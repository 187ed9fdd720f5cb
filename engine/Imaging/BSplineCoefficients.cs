using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>
/// Cubic B-spline coefficients of a whole volume: the 1D prefilter applied separably along x, y and z
/// (once per volume, in double precision), parallel over fixed partitions so the result does not depend on
/// the thread count (each line is filtered independently).
/// </summary>
internal static class BSplineCoefficients
{
    public static double[] Compute(Volume<float> image, int maxDegree = -1)
    {
        var n = image.Size;
        var c = new double[image.Voxels.Length];
        var src = image.Voxels;
        for (int i = 0; i < c.Length; i++) c[i] = src[i];
        if (n.X > 1) FilterAxis(c, n, 0, maxDegree);
        if (n.Y > 1) FilterAxis(c, n, 1, maxDegree);
        if (n.Z > 1) FilterAxis(c, n, 2, maxDegree);
        return c;
    }

    /// <summary>Filters every line along one axis (0 = x, 1 = y, 2 = z).</summary>
    private static void FilterAxis(double[] c, Size3 n, int axis, int maxDegree)
    {
        int len = n[axis];
        int stride = axis == 0 ? 1 : axis == 1 ? n.X : n.X * n.Y;
        int lines = c.Length / len;
        ParallelRange.For(lines, 256, (_, start, end) =>
        {
            var line = new double[len];
            for (int l = start; l < end; l++)
            {
                int first = FirstElement(l, n, axis);
                for (int k = 0; k < len; k++) line[k] = c[first + k * stride];
                BSplineKernel.Prefilter(line);
                for (int k = 0; k < len; k++) c[first + k * stride] = line[k];
            }
        }, maxDegree);
    }

    /// <summary>Linear index of the first element of line <paramref name="l"/> along <paramref name="axis"/>.</summary>
    private static int FirstElement(int l, Size3 n, int axis) => axis switch
    {
        0 => l * n.X,                          // lines along x: one per (y, z)
        1 => l % n.X + l / n.X * n.X * n.Y,    // lines along y: one per (x, z)
        _ => l,                                // lines along z: one per (x, y)
    };
}
