using Serimetry.Engine.Core;
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
    /// <summary>Iterations per level, coarse to fine.</summary>
    public IReadOnlyList<int> IterationsPerLevel => Levels.Select(l => l.Iterations).ToArray();
}
