using Serimetry.Engine.Core;

namespace Serimetry.Engine.Diffusion;

/// <summary>
/// Finds circular vials in a phantom's low-b image: threshold at a fraction of the 99th percentile, 6-connected
/// components of at least MinVialVoxels, then per slice a disc of RoiRadiusFraction × the equivalent radius
/// around the component's centroid (labels 1, 2, … in scan order; at most 255).
/// </summary>
internal static class VialFinder
{
    internal static Volume<byte> Find(Volume<float> image, DwiPhantomOptions options)
    {
        var size = image.Size;
        var sorted = image.Voxels.Where(float.IsFinite).Order().ToArray();
        float p99 = sorted.Length == 0 ? 0 : sorted[(int)(0.99 * (sorted.Length - 1))];
        float threshold = (float)(options.VialThresholdFraction * p99);
        var component = new int[image.Voxels.Length];
        var rois = image.Like<byte>();
        var queue = new int[image.Voxels.Length];
        int nextLabel = 0, roiLabel = 0;
        for (int seed = 0; seed < component.Length; seed++)
        {
            if (component[seed] != 0 || !(image.Voxels[seed] > threshold) || p99 <= 0) continue;
            int count = Flood(image.Voxels, component, queue, seed, ++nextLabel, threshold, size);
            if (count < options.MinVialVoxels || roiLabel == 255) continue;
            DrawDiscs(image, component, queue.AsSpan(0, count), nextLabel, ++roiLabel, rois, options.RoiRadiusFraction);
        }
        return rois;
    }

    private static int Flood(float[] v, int[] comp, int[] queue, int seed, int label, float threshold, Size3 size)
    {
        int head = 0, tail = 0;
        queue[tail++] = seed;
        comp[seed] = label;
        int sx = size.X, sxy = size.X * size.Y;
        while (head < tail)
        {
            int p = queue[head++];
            int i = p % sx, j = p / sx % size.Y, k = p / sxy;
            TryAdd(i > 0, p - 1); TryAdd(i < sx - 1, p + 1);
            TryAdd(j > 0, p - sx); TryAdd(j < size.Y - 1, p + sx);
            TryAdd(k > 0, p - sxy); TryAdd(k < size.Z - 1, p + sxy);
        }
        return tail;

        void TryAdd(bool inside, int q)
        {
            if (!inside || comp[q] != 0 || !(v[q] > threshold)) return;
            comp[q] = label;
            queue[tail++] = q;
        }
    }

    private static void DrawDiscs(Volume<float> image, int[] comp, ReadOnlySpan<int> members, int label, int roiLabel,
        Volume<byte> rois, double radiusFraction)
    {
        int sx = image.Size.X, sxy = sx * image.Size.Y;
        var perSlice = new Dictionary<int, (double Si, double Sj, int N)>();
        foreach (int p in members)
        {
            int k = p / sxy, i = p % sx, j = p / sx % image.Size.Y;
            perSlice.TryGetValue(k, out var acc);
            perSlice[k] = (acc.Si + i, acc.Sj + j, acc.N + 1);
        }
        double dx = image.Geometry.SpacingMm.X, dy = image.Geometry.SpacingMm.Y;
        foreach (var (k, acc) in perSlice)
        {
            double ci = acc.Si / acc.N, cj = acc.Sj / acc.N;
            double r = radiusFraction * Math.Sqrt(acc.N * dx * dy / Math.PI);
            foreach (int p in members)
            {
                if (p / sxy != k) continue;
                double di = (p % sx - ci) * dx, dj = (p / sx % image.Size.Y - cj) * dy;
                if (di * di + dj * dj <= r * r && comp[p] == label) rois.Voxels[p] = (byte)roiLabel;
            }
        }
    }
}
