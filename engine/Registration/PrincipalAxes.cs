using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>
/// Image moments for initialisation: the intensity-weighted centroid and the principal axes (eigenvectors
/// of the second central moments) of the voxels brighter than the image mean.
/// </summary>
internal static class PrincipalAxes
{
    /// <summary>Centroid (LPS mm) and the 3x3 second central moment matrix (mm²).</summary>
    public static (Vec3 Centroid, double[] Moments) Compute(Volume<float> image)
    {
        var v = image.Voxels;
        double mean = 0;
        foreach (var x in v) mean += x;
        mean /= v.Length;
        var g = image.Geometry;
        double sw = 0;
        Span<double> s1 = stackalloc double[3];
        Span<double> s2 = stackalloc double[9];
        s1.Clear(); s2.Clear();
        int idx = 0;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++, idx++)
                {
                    double w = v[idx] - mean;
                    if (w <= 0) continue;
                    var p = g.IndexToPhysical(i, j, k);
                    sw += w;
                    for (int a = 0; a < 3; a++)
                    {
                        s1[a] += w * p[a];
                        for (int b = 0; b < 3; b++) s2[a * 3 + b] += w * p[a] * p[b];
                    }
                }
        if (sw <= 0) return (g.CenterMm, new double[9]);
        var c = new Vec3(s1[0] / sw, s1[1] / sw, s1[2] / sw);
        var m = new double[9];
        for (int a = 0; a < 3; a++)
            for (int b = 0; b < 3; b++) m[a * 3 + b] = s2[a * 3 + b] / sw - c[a] * c[b];
        return (c, m);
    }

    /// <summary>
    /// The rotation taking the fixed principal axes onto the moving ones; of the four sign choices with
    /// determinant +1, the one with the smallest angle (principal axes have no preferred direction).
    /// </summary>
    public static Mat3 AlignAxes(double[] fixedMoments, double[] movingMoments)
    {
        var ef = Eigenvectors(fixedMoments);
        var em = Eigenvectors(movingMoments);
        Mat3 best = Mat3.Identity;
        double bestTrace = double.NegativeInfinity;
        foreach (var (sx, sy) in new[] { (1, 1), (1, -1), (-1, 1), (-1, -1) })
        {
            var signs = Mat3.Diagonal(new Vec3(sx, sy, sx * sy * em.Determinant * ef.Determinant));
            var r = em * signs * ef.Transpose();
            double trace = r.M00 + r.M11 + r.M22;
            if (trace > bestTrace) { bestTrace = trace; best = r; }
        }
        return best;
    }

    /// <summary>Eigenvectors (columns, by decreasing eigenvalue) of a symmetric 3x3 matrix by cyclic Jacobi rotations.</summary>
    internal static Mat3 Eigenvectors(double[] symmetric)
    {
        var a = (double[])symmetric.Clone();
        var v = new double[] { 1, 0, 0, 0, 1, 0, 0, 0, 1 };
        for (int sweep = 0; sweep < 50; sweep++)
        {
            double off = a[1] * a[1] + a[2] * a[2] + a[5] * a[5];
            if (off < 1e-24 * (a[0] * a[0] + a[4] * a[4] + a[8] * a[8] + 1e-300)) break;
            for (int p = 0; p < 2; p++)
                for (int q = p + 1; q < 3; q++) Rotate(a, v, p, q);
        }
        var order = new[] { 0, 1, 2 }.OrderByDescending(i => a[i * 4]).ToArray();
        Vec3 Col(int c) => new(v[c], v[3 + c], v[6 + c]);
        return Mat3.FromColumns(Col(order[0]), Col(order[1]), Col(order[2]));
    }

    private static void Rotate(double[] a, double[] v, int p, int q)
    {
        double apq = a[p * 3 + q];
        if (Math.Abs(apq) < 1e-300) return;
        double theta = (a[q * 3 + q] - a[p * 3 + p]) / (2 * apq);
        double t = Math.Sign(theta) / (Math.Abs(theta) + Math.Sqrt(theta * theta + 1));
        if (theta == 0) t = 1;
        double c = 1 / Math.Sqrt(t * t + 1), s = t * c;
        for (int k = 0; k < 3; k++)
        {
            double akp = a[k * 3 + p], akq = a[k * 3 + q];
            a[k * 3 + p] = c * akp - s * akq;
            a[k * 3 + q] = s * akp + c * akq;
        }
        for (int k = 0; k < 3; k++)
        {
            double apk = a[p * 3 + k], aqk = a[q * 3 + k];
            a[p * 3 + k] = c * apk - s * aqk;
            a[q * 3 + k] = s * apk + c * aqk;
        }
        for (int k = 0; k < 3; k++)
        {
            double vkp = v[k * 3 + p], vkq = v[k * 3 + q];
            v[k * 3 + p] = c * vkp - s * vkq;
            v[k * 3 + q] = s * vkp + c * vkq;
        }
    }
}
