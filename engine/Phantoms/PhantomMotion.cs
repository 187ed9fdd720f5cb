using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Optional mild deformation of a visit, defined on the baseline side: the visit voxel at q shows the baseline
/// point p = x + u(x) with x = T⁻¹(q) and u(x) = A·(sin(2π(y−cy)/λ + φx), sin(2π(z−cz)/λ + φy), sin(2π(x−cx)/λ + φz))
/// (c = gland centre). Each component varies along another axis, so div u = 0 and local volume is preserved to
/// second order (|det(I + ∇u) − 1| ≤ (2πA/λ)³).
/// </summary>
/// <param name="AmplitudeMm">A.</param>
/// <param name="WavelengthMm">λ.</param>
/// <param name="PhaseRad">(φx, φy, φz).</param>
public sealed record PhantomDeformation(double AmplitudeMm, double WavelengthMm, Vec3 PhaseRad);

/// <summary>The true motion of one visit: rigid transform plus optional deformation.</summary>
internal sealed class PhantomMotion(AffineTransform baselineToVisit, PhantomDeformation? deformation, Vec3 centreMm)
{
    private readonly AffineTransform _inverse = baselineToVisit.Inverse();

    internal PhantomDeformation? Deformation => deformation;

    /// <summary>The baseline point shown at visit point q.</summary>
    internal Vec3 VisitToBaseline(Vec3 q)
    {
        var x = _inverse.TransformPoint(q);
        return deformation is null ? x : x + Displacement(x);
    }

    /// <summary>The visit point showing baseline point p (fixed-point inversion of x + u(x) = p; converges as |∇u| &lt; 1).</summary>
    internal Vec3 BaselineToVisit(Vec3 p)
    {
        var x = p;
        if (deformation is not null)
            for (int i = 0; i < 50; i++) x = p - Displacement(x);
        return baselineToVisit.TransformPoint(x);
    }

    private Vec3 Displacement(Vec3 x)
    {
        var d = deformation!;
        double k = 2 * Math.PI / d.WavelengthMm;
        var r = x - centreMm;
        return new Vec3(Math.Sin(k * r.Y + d.PhaseRad.X), Math.Sin(k * r.Z + d.PhaseRad.Y), Math.Sin(k * r.X + d.PhaseRad.Z)) * d.AmplitudeMm;
    }
}
