using Serimetry.Engine.Core;

namespace Serimetry.Tests.Shared;

/// <summary>
/// The analytic registration phantom seen through a known smooth deformation (test-side truth):
/// φ(b) = b + s + d(b), d_axis(b) = −κ·(b_axis − c_axis)·exp(−|b − c|²/(2σ²)) with c the gland centre, so the
/// gland is compressed by κ (10 %) along one axis near its centre, fading out over σ, then shifted by s.
/// The follow-up image shows body point φ⁻¹(y) at scanner point y (φ⁻¹ by fixed-point iteration, a
/// contraction because |∇d| &lt; 1).
/// </summary>
public sealed record DeformedPhantom(double Kappa, int Axis, double SigmaMm, Vec3 ShiftMm) : ISpatialTransform
{
    /// <summary>Lesion semi-axes scale in the follow-up (1 = unchanged; ∛2 = volume ×2.0, grown in place).</summary>
    public double LesionScale { get; init; } = 1;

    public Vec3 TransformPoint(Vec3 b) => b + ShiftMm + Displacement(b);

    private Vec3 Displacement(Vec3 b)
    {
        var r = b - RegistrationPhantom.GlandCenter;
        double w = Math.Exp(-(r.X * r.X + r.Y * r.Y + r.Z * r.Z) / (2 * SigmaMm * SigmaMm));
        double v = -Kappa * r[Axis] * w;
        return Axis switch { 0 => new Vec3(v, 0, 0), 1 => new Vec3(0, v, 0), _ => new Vec3(0, 0, v) };
    }

    public Vec3 Inverse(Vec3 y)
    {
        var b = y - ShiftMm;
        for (int it = 0; it < 40; it++) b = y - ShiftMm - Displacement(b);
        return b;
    }

    /// <summary>det ∇φ by central differences (h = 0.01 mm) of the analytic map.</summary>
    public double JacobianDeterminant(Vec3 b)
    {
        const double h = 0.01;
        Vec3 D(Vec3 e) => (TransformPoint(b + e * h) - TransformPoint(b - e * h)) / (2 * h);
        return Mat3.FromColumns(D(new Vec3(1, 0, 0)), D(new Vec3(0, 1, 0)), D(new Vec3(0, 0, 1))).Determinant;
    }

    /// <summary>Renders the follow-up on <paramref name="grid"/>: three sub-samples across the slice as the phantom does, Rician noise σ.</summary>
    public Volume<float> Render(Geometry grid, double noise, int seed, PhantomContrast contrast = PhantomContrast.T2w)
    {
        var vol = new Volume<float>(grid);
        Parallel.For(0, grid.Size.Z, k =>
        {
            var rng = new Random(seed * 1000 + k);
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                {
                    double acc = 0;
                    for (int s = 0; s < 3; s++)
                        acc += RegistrationPhantom.Value(Inverse(grid.IndexToPhysical(new Vec3(i, j, k + (s - 1) / 3.0 * 0.8))), contrast, LesionScale);
                    double v = acc / 3;
                    double n1 = noise * Gaussian(rng), n2 = noise * Gaussian(rng);
                    vol[i, j, k] = (float)Math.Sqrt((v + n1) * (v + n1) + n2 * n2);
                }
        });
        return vol;
    }

    private static double Gaussian(Random r) =>
        Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());
}
