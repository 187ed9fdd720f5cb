using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>T(x) = x + t, parameters (tx, ty, tz) in mm.</summary>
internal sealed class TranslationTransform : IParametricTransform
{
    private static readonly string[] Names = ["tx", "ty", "tz"];

    public TranslationTransform(Vec3 translationMm) => TranslationMm = translationMm;

    public Vec3 TranslationMm { get; private set; }

    public string Kind => "translation";

    public int ParameterCount => 3;

    public IReadOnlyList<string> ParameterNames => Names;

    public Vec3 TransformPoint(Vec3 fixedPointMm) => fixedPointMm + TranslationMm;

    public void GetParameters(Span<double> destination)
    {
        destination[0] = TranslationMm.X;
        destination[1] = TranslationMm.Y;
        destination[2] = TranslationMm.Z;
    }

    public void SetParameters(ReadOnlySpan<double> parameters) =>
        TranslationMm = new Vec3(parameters[0], parameters[1], parameters[2]);

    public void ProjectGradient(Vec3 fixedPointMm, Vec3 movingGradient, Span<double> result)
    {
        result[0] = movingGradient.X;
        result[1] = movingGradient.Y;
        result[2] = movingGradient.Z;
    }

    public AffineTransform ToAffine() => new(Mat3.Identity, TranslationMm);
}
