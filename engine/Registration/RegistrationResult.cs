using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;
using Serimetry.Engine.Registration.Optimizers;

namespace Serimetry.Engine.Registration;

/// <summary>What happened at one resolution level: grid coarsening and smoothing actually used, samples, iterations, stop reason.</summary>
public sealed record LevelReport(int Index, Size3 FixedShrink, Size3 MovingShrink, Vec3 FixedSigmaMm, int Samples, int Seed,
    int Iterations, StopReason StopReason, double MetricStart, double MetricEnd, double ElapsedSeconds);

/// <summary>Progress of a running registration.</summary>
public sealed record RegistrationProgress(int Level, int LevelCount, int Iteration, double Metric);

/// <summary>
/// The outcome of a registration: the transform (fixed LPS mm → moving LPS mm), quality figures and the
/// settings used. <see cref="MetricBefore"/> is the metric at the identity transform and
/// <see cref="MetricAfter"/> at the result, both on the finest level's samples (lower is better).
/// </summary>
public sealed record RegistrationResult(
    AffineTransform Transform,
    string TransformType,
    string MetricName,
    double MetricBefore,
    double MetricAfter,
    IReadOnlyList<LevelReport> Levels,
    StopReason StopReason,
    IReadOnlyList<string> Warnings,
    RegistrationOptions Settings,
    IReadOnlyList<double> Parameters,
    IReadOnlyList<string> ParameterNames,
    Vec3 CenterOfRotationMm,
    double RotationDeg,
    double ShiftMm,
    double ElapsedSeconds)
{
    /// <summary>
    /// The B-spline free-form part of a <c>deformable</c> registration (null otherwise): the whole map is
    /// <see cref="BSplineDeformation.TransformPoint"/>, whose <see cref="BSplineDeformation.Bulk"/> equals
    /// <see cref="Transform"/>. <see cref="Transform"/> alone stays the affine (rigid) part for callers that
    /// only handle 4x4 maps.
    /// </summary>
    public BSplineDeformation? Deformation { get; init; }

    /// <summary>The B-spline stage's metric (<c>normalized-mean-squares</c> or <c>mattes-mi</c>); null without one.</summary>
    public string? DeformationMetricName { get; init; }

    /// <summary>Levels of the B-spline stage (empty without one); <see cref="Levels"/> are the bulk stage's.</summary>
    public IReadOnlyList<LevelReport> DeformationLevels { get; init; } = [];

    /// <summary>
    /// With a lesion mask and a B-spline stage: the volume ratio the free-form part alone imposes on the lesion,
    /// ∫_lesion det(∂T/∂x) / det A ÷ ∫_lesion 1 (<see cref="JacobianVolume.AbsorbedChange"/>). 1.0 = the
    /// deformation absorbed none of the lesion's change; otherwise null.
    /// </summary>
    public double? AbsorbedChange { get; init; }

    /// <summary>The full map: the deformation when there is one, else the affine transform.</summary>
    public ISpatialTransform FullTransform => (ISpatialTransform?)Deformation ?? Transform;

    /// <summary>Iterations per level, coarse to fine.</summary>
    public IReadOnlyList<int> IterationsPerLevel => Levels.Select(l => l.Iterations).ToArray();
}
