using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging.Morphology;

/// <summary>
/// Exact Euclidean distance transform in millimetres on anisotropic grids, by the separable lower-envelope
/// algorithm of Felzenszwalb and Huttenlocher ("Distance transforms of sampled functions", Theory of
/// Computing 8, 2012): one 1D pass per index axis, each weighted by that axis's spacing.
/// Distances are between voxel centres in index space scaled by spacing (direction cosines do not change them).
/// </summary>
public static class DistanceTransform
{
    private const float Infinity = 1e20f;

    /// <summary>Squared distance (mm²) from every voxel to the nearest voxel where <paramref name="mask"/> is non-zero (0 inside).</summary>
    public static float[] SquaredDistanceToMaskMm2(Volume<byte> mask)
    {
        var size = mask.Size;
        var d = new float[mask.Voxels.Length];
        var src = mask.Voxels;
        for (int n = 0; n < d.Length; n++) d[n] = src[n] != 0 ? 0f : Infinity;
        var sp = mask.Geometry.SpacingMm;
        Pass(d, size, axis: 0, (float)sp.X);
        Pass(d, size, axis: 1, (float)sp.Y);
        Pass(d, size, axis: 2, (float)sp.Z);
        return d;
    }

    private static void Pass(float[] d, Size3 size, int axis, float spacing)
    {
        int n = size[axis];
        int stride = axis switch { 0 => 1, 1 => size.X, _ => size.X * size.Y };
        int lines = (int)(size.Count / n);
        float w2 = spacing * spacing;
        ParallelRange.For(lines, 256, (_, start, end) =>
        {
            var f = new float[n];
            var outLine = new float[n];
            var v = new int[n];
            var z = new float[n + 1];
            for (int line = start; line < end; line++)
            {
                int baseIndex = LineStart(line, axis, size);
                for (int q = 0; q < n; q++) f[q] = d[baseIndex + q * stride];
                Envelope(f, outLine, v, z, w2);
                for (int q = 0; q < n; q++) d[baseIndex + q * stride] = outLine[q];
            }
        });
    }

    private static int LineStart(int line, int axis, Size3 s) => axis switch
    {
        0 => line * s.X,
        1 => (line / s.X) * s.X * s.Y + line % s.X,
        _ => line,
    };

    /// <summary>1D squared distance with sample spacing² <paramref name="w2"/>: out[q] = min_p f[p] + w2 (q−p)².</summary>
    private static void Envelope(float[] f, float[] result, int[] v, float[] z, float w2)
    {
        int n = f.Length;
        int k = -1;
        for (int q = 0; q < n; q++)
        {
            if (f[q] >= Infinity) continue;
            while (k >= 0)
            {
                float s = Intersection(f, v[k], q, w2);
                if (s <= z[k]) k--;
                else break;
            }
            k++;
            v[k] = q;
            z[k] = k == 0 ? float.NegativeInfinity : Intersection(f, v[k - 1], q, w2);
            z[k + 1] = float.PositiveInfinity;
        }
        if (k < 0)
        {
            Array.Fill(result, Infinity);
            return;
        }
        int j = 0;
        for (int q = 0; q < n; q++)
        {
            while (z[j + 1] < q) j++;
            float dq = q - v[j];
            result[q] = f[v[j]] + w2 * dq * dq;
        }
    }

    private static float Intersection(float[] f, int p, int q, float w2) =>
        ((f[q] + w2 * q * q) - (f[p] + w2 * p * p)) / (2f * w2 * (q - p));
}
