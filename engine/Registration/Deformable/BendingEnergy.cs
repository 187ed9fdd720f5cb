using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// Discrete bending energy of a control grid: the mean over interior control points of
/// Σ_d [Σ_a (∂²u_d/∂x_a²)² + 2 Σ_{a&lt;b} (∂²u_d/∂x_a∂x_b)²] with the second derivatives taken as central
/// second differences of the coefficients divided by the grid spacings (so the value is in mm⁻²). It approximates
/// the thin-plate bending energy of Rueckert et al. (IEEE TMI 18(8), 1999) at a fraction of the cost and is
/// zero for any affine displacement field, so it penalises only non-affine bending.
/// </summary>
internal static class BendingEnergy
{
    /// <summary>The energy; adds weight·∂E/∂c to <paramref name="gradient"/> when it is not empty.</summary>
    public static double Evaluate(BSplineDeformation t, double weight, Span<double> gradient)
    {
        var c = t.CoefficientArray;
        var size = t.GridSize;
        int nx = size.X, ny = size.Y, nz = size.Z, n = t.PointCount;
        int sx = 1, sy = nx, sz = nx * ny;
        double norm = 1.0 / ((nx - 2) * (ny - 2) * (nz - 2));
        var sp = t.GridSpacingMm;
        ReadOnlySpan<double> inv = [1 / sp.X, 1 / sp.Y, 1 / sp.Z];
        double sum = 0;
        bool grad = !gradient.IsEmpty;
        ReadOnlySpan<int> axes = [sx, sy, sz];
        for (int d = 0; d < 3; d++)
        {
            int off = d * n;
            for (int k = 1; k < nz - 1; k++)
                for (int j = 1; j < ny - 1; j++)
                    for (int i = 1; i < nx - 1; i++)
                    {
                        int p = off + i + nx * (j + ny * k);
                        for (int a = 0; a < 3; a++)
                        {
                            int ea = axes[a];
                            double ka = inv[a] * inv[a];
                            double v = (c[p + ea] - 2 * c[p] + c[p - ea]) * ka;
                            sum += v * v;
                            if (grad)
                            {
                                double g = 2 * weight * norm * v * ka;
                                gradient[p + ea] += g; gradient[p - ea] += g; gradient[p] -= 2 * g;
                            }
                            for (int b = a + 1; b < 3; b++)
                            {
                                int eb = axes[b];
                                double kab = 0.25 * inv[a] * inv[b];
                                double m = kab * (c[p + ea + eb] - c[p + ea - eb] - c[p - ea + eb] + c[p - ea - eb]);
                                sum += 2 * m * m;
                                if (!grad) continue;
                                double h = 4 * weight * norm * m * kab;
                                gradient[p + ea + eb] += h; gradient[p - ea - eb] += h;
                                gradient[p + ea - eb] -= h; gradient[p - ea + eb] -= h;
                            }
                        }
                    }
        }
        return sum * norm;
    }
}
