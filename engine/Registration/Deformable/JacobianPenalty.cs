using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// A guard against folding: the mean over the interior control-point positions of max(0, τ − det ∂T/∂x)², zero
/// while every local volume ratio stays above τ (so it does not bias ordinary compression), growing quadratically
/// as the map approaches folding (det ≤ 0). Its gradient uses ∂det J/∂J = cof J (Jacobi's formula) and
/// ∂J/∂c_{d,k} = e_d ⊗ ∇β_k.
/// </summary>
internal static class JacobianPenalty
{
    /// <summary>The penalty; adds weight·∂P/∂c to <paramref name="gradient"/> when it is not empty.</summary>
    public static double Evaluate(BSplineDeformation t, double threshold, double weight, Span<double> gradient)
    {
        var size = t.GridSize;
        int n = t.PointCount, count = 0;
        double sum = 0;
        Span<int> idx = stackalloc int[BSplineDeformation.SupportSize];
        Span<double> gx = stackalloc double[BSplineDeformation.SupportSize];
        Span<double> gy = stackalloc double[BSplineDeformation.SupportSize];
        Span<double> gz = stackalloc double[BSplineDeformation.SupportSize];
        var terms = new List<(Vec3 Point, double Excess)>();
        for (int k = 1; k < size.Z - 1; k++)
            for (int j = 1; j < size.Y - 1; j++)
                for (int i = 1; i < size.X - 1; i++)
                {
                    var x = t.ControlPointPosition(i, j, k);
                    double e = threshold - t.JacobianDeterminant(x);
                    count++;
                    if (e <= 0) continue;
                    sum += e * e;
                    terms.Add((x, e));
                }
        if (count == 0) return 0;
        if (!gradient.IsEmpty)
        {
            foreach (var (x, e) in terms)
            {
                var jac = t.SpatialJacobian(x);
                var cof = Cofactor(jac);
                t.SupportGradients(x, idx, gx, gy, gz);
                double a = -2 * e * weight / count;
                for (int m = 0; m < BSplineDeformation.SupportSize; m++)
                {
                    int p = idx[m];
                    if (p < 0) continue;
                    for (int d = 0; d < 3; d++)
                        gradient[d * n + p] += a * (cof[d, 0] * gx[m] + cof[d, 1] * gy[m] + cof[d, 2] * gz[m]);
                }
            }
        }
        return sum / count;
    }

    /// <summary>The cofactor matrix: ∂det(J)/∂J_{rc}.</summary>
    internal static Mat3 Cofactor(Mat3 j) => new(
        j.M11 * j.M22 - j.M12 * j.M21, j.M12 * j.M20 - j.M10 * j.M22, j.M10 * j.M21 - j.M11 * j.M20,
        j.M02 * j.M21 - j.M01 * j.M22, j.M00 * j.M22 - j.M02 * j.M20, j.M01 * j.M20 - j.M00 * j.M21,
        j.M01 * j.M12 - j.M02 * j.M11, j.M02 * j.M10 - j.M00 * j.M12, j.M00 * j.M11 - j.M01 * j.M10);
}
