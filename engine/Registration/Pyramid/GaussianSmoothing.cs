using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Pyramid;

/// <summary>
/// Separable Gaussian smoothing with a per-axis σ in mm (so a 3 mm slice axis is smoothed less, in voxels,
/// than a 0.6 mm in-plane axis). Sampled kernel truncated at 3σ and renormalised; edges are clamped.
/// Rows are processed in parallel; every output voxel depends only on the input, so results do not depend
/// on thread count.
/// </summary>
internal static class GaussianSmoothing
{
    public static Volume<float> Smooth(Volume<float> image, Vec3 sigmaMm, int maxThreads = -1)
    {
        var current = image.Voxels;
        var size = image.Size;
        var spacing = image.Geometry.SpacingMm;
        bool any = false;
        for (int axis = 0; axis < 3; axis++)
        {
            double sigmaVox = sigmaMm[axis] / spacing[axis];
            if (sigmaVox < 0.1 || size[axis] == 1) continue;
            current = SmoothAxis(current, size, axis, Kernel(sigmaVox), maxThreads);
            any = true;
        }
        return any ? new Volume<float>(image.Geometry, current) : image;
    }

    internal static float[] Kernel(double sigmaVox)
    {
        int r = Math.Max(1, (int)Math.Ceiling(3 * sigmaVox));
        var k = new float[2 * r + 1];
        double sum = 0;
        for (int i = -r; i <= r; i++) sum += k[i + r] = (float)Math.Exp(-0.5 * i * i / (sigmaVox * sigmaVox));
        for (int i = 0; i < k.Length; i++) k[i] = (float)(k[i] / sum);
        return k;
    }

    private static float[] SmoothAxis(float[] src, Size3 size, int axis, float[] kernel, int maxThreads)
    {
        var dst = new float[src.Length];
        int n = size[axis];
        int stride = axis == 0 ? 1 : axis == 1 ? size.X : size.X * size.Y;
        int lines = src.Length / n;
        int r = kernel.Length / 2;
        ParallelRange.For(lines, 256, (_, start, end) =>
        {
            var line = new float[n];
            for (int l = start; l < end; l++)
            {
                int baseIndex = LineStart(l, axis, size);
                for (int i = 0; i < n; i++) line[i] = src[baseIndex + i * stride];
                for (int i = 0; i < n; i++)
                {
                    double acc = 0;
                    for (int t = -r; t <= r; t++) acc += kernel[t + r] * line[Math.Clamp(i + t, 0, n - 1)];
                    dst[baseIndex + i * stride] = (float)acc;
                }
            }
        }, maxThreads);
        return dst;
    }

    /// <summary>Linear index of the first voxel of line <paramref name="l"/> along <paramref name="axis"/>.</summary>
    private static int LineStart(int l, int axis, Size3 s) => axis switch
    {
        0 => l * s.X,
        1 => (l / s.X) * s.X * s.Y + (l % s.X),
        _ => l,
    };
}
