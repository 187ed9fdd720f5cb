namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>Eigenvalues of a symmetric 3×3 matrix by cyclic Jacobi rotations (descending order).</summary>
internal static class SymmetricEigen
{
    public static double[] Values(double[,] input)
    {
        var a = (double[,])input.Clone();
        for (int sweep = 0; sweep < 50; sweep++)
        {
            double off = a[0, 1] * a[0, 1] + a[0, 2] * a[0, 2] + a[1, 2] * a[1, 2];
            if (off < 1e-30) break;
            for (int p = 0; p < 2; p++)
            for (int q = p + 1; q < 3; q++)
            {
                if (Math.Abs(a[p, q]) < 1e-300) continue;
                double theta = (a[q, q] - a[p, p]) / (2 * a[p, q]);
                double t = Math.Sign(theta == 0 ? 1 : theta) / (Math.Abs(theta) + Math.Sqrt(theta * theta + 1));
                double c = 1 / Math.Sqrt(t * t + 1), s = t * c;
                Rotate(a, p, q, c, s);
            }
        }
        double[] values = [a[0, 0], a[1, 1], a[2, 2]];
        Array.Sort(values);
        Array.Reverse(values);
        return values;
    }

    // A ← Jᵀ A J for the Jacobi rotation J in the (p, q) plane.
    private static void Rotate(double[,] a, int p, int q, double c, double s)
    {
        for (int k = 0; k < 3; k++)
        {
            double akp = a[k, p], akq = a[k, q];
            a[k, p] = c * akp - s * akq;
            a[k, q] = s * akp + c * akq;
        }
        for (int k = 0; k < 3; k++)
        {
            double apk = a[p, k], aqk = a[q, k];
            a[p, k] = c * apk - s * aqk;
            a[q, k] = s * apk + c * aqk;
        }
    }
}
