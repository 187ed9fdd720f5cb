using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>
/// A transform with a parameter vector, as the optimizer sees it (the ITK transform decomposition):
/// maps fixed points to moving points in LPS mm and gives the derivative of the mapped point with
/// respect to each parameter.
/// </summary>
internal interface IParametricTransform : ISpatialTransform
{
    /// <summary>"translation", "rigid" or "affine".</summary>
    string Kind { get; }

    int ParameterCount { get; }

    /// <summary>Copies the current parameters into <paramref name="destination"/>.</summary>
    void GetParameters(Span<double> destination);

    void SetParameters(ReadOnlySpan<double> parameters);

    /// <summary>
    /// Writes gᵀ·∂T(x)/∂p for every parameter p into <paramref name="result"/>: the chain rule step from a
    /// moving-image gradient g (per mm) at T(x) to the derivative of the sampled value wrt the parameters.
    /// </summary>
    void ProjectGradient(Vec3 fixedPointMm, Vec3 movingGradient, Span<double> result);

    /// <summary>The current map as a 4x4-representable affine transform.</summary>
    AffineTransform ToAffine();

    /// <summary>Names of the parameters, for reports.</summary>
    IReadOnlyList<string> ParameterNames { get; }
}
