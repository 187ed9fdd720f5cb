using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// Keeps the free-form part of a deformation from changing the lesion's volume: the mean over lesion voxel
/// centres of (det ∂T/∂x / det A − 1)², A the bulk affine part, so a lesion that grew between visits is not
/// "aligned away" by local expansion and its change stays for the re-fit to measure. Gradient by Jacobi's
/// formula, ∂det J/∂c_{d,k} = Σ_j cof(J)_{dj} ∂β_k/∂x_j (as <see cref="JacobianPenalty"/>).
/// </summary>
internal sealed class LesionVolumeTerm
{
    private readonly Vec3[] _points;

    private LesionVolumeTerm(Vec3[] points) => _points = points;

    /// <summary>Points (LPS mm) at which the term is evaluated.</summary>
    public int PointCount => _points.Length;

    /// <summary>The lesion's voxel centres, every s-th in index order so at most <paramref name="maxPoints"/> (deterministic).</summary>
    public static LesionVolumeTerm FromMask(Volume<byte> lesion, int maxPoints = 3000)
    {
        var g = lesion.Geometry;
        var v = lesion.Voxels;
        long count = 0;
        foreach (var b in v) if (b != 0) count++;
        long stride = Math.Max(1, (count + maxPoints - 1) / maxPoints);
        var points = new List<Vec3>((int)Math.Min(count, maxPoints));
        int nx = g.Size.X, nxy = nx * g.Size.Y;
        long seen = 0;
        for (int idx = 0; idx < v.Length; idx++)
        {
            if (v[idx] == 0 || seen++ % stride != 0) continue;
            int k = idx / nxy, r = idx - k * nxy, j = r / nx, i = r - j * nx;
            points.Add(g.IndexToPhysical(i, j, k));
        }
        return new LesionVolumeTerm(points.ToArray());
    }

    /// <summary>The term; adds weight·∂/∂c to <paramref name="gradient"/> when it is not empty.</summary>
    public double Evaluate(BSplineDeformation t, double weight, Span<double> gradient)
    {
        if (_points.Length == 0) return 0;
        double invDetA = 1 / t.Bulk.Linear.Determinant;
        int n = t.PointCount;
        Span<int> idx = stackalloc int[BSplineDeformation.SupportSize];
        Span<double> gx = stackalloc double[BSplineDeformation.SupportSize];
        Span<double> gy = stackalloc double[BSplineDeformation.SupportSize];
        Span<double> gz = stackalloc double[BSplineDeformation.SupportSize];
        double sum = 0, scale = 1.0 / _points.Length;
        foreach (var x in _points)
        {
            var jac = t.SpatialJacobian(x);
            double r = jac.Determinant * invDetA - 1;
            sum += r * r;
            if (gradient.IsEmpty || r == 0) continue;
            var cof = JacobianPenalty.Cofactor(jac);
            t.SupportGradients(x, idx, gx, gy, gz);
            double a = 2 * r * invDetA * weight * scale;
            for (int m = 0; m < BSplineDeformation.SupportSize; m++)
            {
                int p = idx[m];
                if (p < 0) continue;
                for (int d = 0; d < 3; d++)
                    gradient[d * n + p] += a * (cof[d, 0] * gx[m] + cof[d, 1] * gy[m] + cof[d, 2] * gz[m]);
            }
        }
        return sum * scale;
    }
}
