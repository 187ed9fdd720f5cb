using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>
/// General affine T(x) = A·(x − c) + c + t about a fixed centre c. Parameters: the nine elements of A
/// row-major, then (tx, ty, tz). Centring keeps the matrix and translation parameters decoupled.
/// </summary>
internal sealed class CenteredAffineTransform : IParametricTransform
{
    private static readonly string[] Names = ["a00", "a01", "a02", "a10", "a11", "a12", "a20", "a21", "a22", "tx", "ty", "tz"];

    public CenteredAffineTransform(Vec3 centerMm, Mat3 linear, Vec3 translationMm)
    {
        CenterMm = centerMm;
        Linear = linear;
        TranslationMm = translationMm;
    }

    /// <summary>Starts from an affine map x ↦ L·x + b, re-expressed about <paramref name="centerMm"/>.</summary>
    public static CenteredAffineTransform From(AffineTransform start, Vec3 centerMm) =>
        new(centerMm, start.Linear, start.TransformPoint(centerMm) - centerMm);

    public Vec3 CenterMm { get; }

    public Mat3 Linear { get; private set; }

    public Vec3 TranslationMm { get; private set; }

    public string Kind => "affine";

    public int ParameterCount => 12;

    public IReadOnlyList<string> ParameterNames => Names;

    public Vec3 TransformPoint(Vec3 fixedPointMm) => Linear * (fixedPointMm - CenterMm) + CenterMm + TranslationMm;

    public void GetParameters(Span<double> destination)
    {
        var m = Linear.ToRowMajor();
        for (int i = 0; i < 9; i++) destination[i] = m[i];
        destination[9] = TranslationMm.X; destination[10] = TranslationMm.Y; destination[11] = TranslationMm.Z;
    }

    public void SetParameters(ReadOnlySpan<double> p)
    {
        Linear = Mat3.FromRowMajor(p[..9]);
        TranslationMm = new Vec3(p[9], p[10], p[11]);
    }

    public void ProjectGradient(Vec3 fixedPointMm, Vec3 g, Span<double> result)
    {
        var d = fixedPointMm - CenterMm;
        result[0] = g.X * d.X; result[1] = g.X * d.Y; result[2] = g.X * d.Z;
        result[3] = g.Y * d.X; result[4] = g.Y * d.Y; result[5] = g.Y * d.Z;
        result[6] = g.Z * d.X; result[7] = g.Z * d.Y; result[8] = g.Z * d.Z;
        result[9] = g.X; result[10] = g.Y; result[11] = g.Z;
    }

    public AffineTransform ToAffine() => new(Linear, CenterMm + TranslationMm - Linear * CenterMm);
}
