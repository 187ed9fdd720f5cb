using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>Which transform family the registration estimates.</summary>
public enum TransformKind { Translation, Rigid, Affine }

/// <summary>The similarity metric (lower is better internally; reported values are the metric as minimised).</summary>
public enum MetricKind
{
    /// <summary>Mattes mutual information (IEEE TMI 22(1), 2003), for any pair of contrasts.</summary>
    MattesMutualInformation,

    /// <summary>Normalized cross-correlation, for contrasts related by gain and offset.</summary>
    Correlation,

    /// <summary>Mean squared difference, for identical contrast and scaling.</summary>
    MeanSquares,
}

/// <summary>The optimizer used at every level.</summary>
public enum OptimizerKind { RegularStepGradientDescent, Lbfgs }

/// <summary>How the transform starts before optimisation.</summary>
public enum InitializationKind
{
    /// <summary>Scanner coordinates are trusted (same exam or same frame of reference).</summary>
    Identity,

    /// <summary>Translation aligning the centres of the two image grids.</summary>
    GeometryCenters,

    /// <summary>Translation aligning intensity centres of mass (voxels above the image mean).</summary>
    CentersOfMass,

    /// <summary>Centres of mass plus the rotation aligning the principal axes (needs the whole object in view).</summary>
    Moments,
}

/// <summary>
/// One level of the multi-resolution schedule. <paramref name="ShrinkFactor"/> is the coarsening relative to
/// the finest in-plane spacing of the fixed image: each axis of each image shrinks by
/// round(ShrinkFactor · finest spacing / axis spacing), at least 1, so 3 mm slices shrink less than 0.6 mm
/// pixels. <paramref name="SmoothingSigmaMm"/> null means σ = half the shrunk spacing on each shrunk axis and
/// none on unshrunk axes. <paramref name="Samples"/> 0 means every voxel in the mask.
/// <paramref name="Seed"/> null means the options' seed plus the level index.
/// </summary>
public sealed record RegistrationLevel(double ShrinkFactor, int Samples, int MaxIterations, double MaxStepMm,
    double MinStepMm, double? SmoothingSigmaMm = null, int? Seed = null);

/// <summary>
/// Everything that decides a registration's result. Use a preset (<see cref="ForPreset"/>) and adjust
/// with <c>with</c>. All values are recorded in the result.
/// </summary>
public sealed record RegistrationOptions
{
    public string Preset { get; init; } = "rigid";
    public TransformKind Transform { get; init; } = TransformKind.Rigid;
    public MetricKind Metric { get; init; } = MetricKind.MattesMutualInformation;

    /// <summary>Histogram bins of Mattes MI (32–64 is usual).</summary>
    public int HistogramBins { get; init; } = 32;

    public OptimizerKind Optimizer { get; init; } = OptimizerKind.RegularStepGradientDescent;
    public InitializationKind Initialization { get; init; } = InitializationKind.GeometryCenters;
    public IReadOnlyList<RegistrationLevel> Levels { get; init; } = DefaultLevels;

    /// <summary>Seed of the sample draws; the same seed gives the same result with any thread count.</summary>
    public int Seed { get; init; } = 1234;

    /// <summary>Grow the fixed mask by this margin (mm, box-shaped) so the metric sees the gland border.</summary>
    public double MaskDilationMm { get; init; } = 20;

    /// <summary>Estimate and divide out a smooth multiplicative bias field in each image before the metric.</summary>
    public bool CorrectBias { get; init; }

    /// <summary>Wall-time budget for the whole registration.</summary>
    public TimeSpan TimeLimit { get; init; } = TimeSpan.FromMinutes(2);

    /// <summary>Worker threads (-1: all cores). Results do not depend on it.</summary>
    public int MaxThreads { get; init; } = -1;

    /// <summary>
    /// Search range: the optimizer may not move the rotation centre further than this (mm) from where the
    /// starting transform puts it (null: unbounded). Steps beyond it count as failed steps.
    /// </summary>
    public double? MaxCenterDisplacementMm { get; init; }

    /// <summary>When set, a cubic B-spline stage follows the bulk transform (the <c>deformable</c> preset).</summary>
    public BSplineStageOptions? BSpline { get; init; }

    /// <summary>Warn when the rotation exceeds this angle (degrees).</summary>
    public double WarnRotationDeg { get; init; } = 20;

    /// <summary>Warn when the displacement at the rotation centre exceeds this distance (mm).</summary>
    public double WarnShiftMm { get; init; } = 30;

    /// <summary>Names accepted by <see cref="ForPreset"/>.</summary>
    public static IReadOnlyList<string> PresetNames { get; } = ["rigid", "affine", "deformable", "within-exam"];

    private static readonly RegistrationLevel[] DefaultLevels =
    [
        new(4, 4000, 200, 2.0, 0.01),
        new(2, 10000, 200, 1.0, 0.005),
        new(1, 40000, 200, 0.5, 0.001),
    ];

    /// <summary>
    /// Follow-up T2w → baseline T2w: rigid, Mattes MI, three levels, grid centres aligned at the start
    /// (technologists centre the field of view on the gland), gland mask grown by 20 mm when given, and
    /// a smooth bias field divided out of each image first (different coil profiles per visit otherwise
    /// limit mutual-information accuracy).
    /// </summary>
    public static RegistrationOptions Rigid() => new() { CorrectBias = true };

    /// <summary>Rigid plus scaling and shear, same schedule.</summary>
    public static RegistrationOptions Affine() => new() { Preset = "affine", Transform = TransformKind.Affine, CorrectBias = true };

    /// <summary>
    /// Gland-shape change between visits: the rigid preset, then a cubic B-spline stage (12 mm control
    /// points, gain-matched mean squares, bending weight 50 mm², L-BFGS, two levels). Same-contrast series only.
    /// </summary>
    public static RegistrationOptions Deformable() => Rigid() with { Preset = "deformable", BSpline = new BSplineStageOptions() };

    /// <summary>
    /// ADC/DWI → T2w of the same exam: rigid, Mattes MI (robust to EPI contrast), identity start (same
    /// scanner frame), three levels with small steps, a 15 mm search range and tighter plausibility
    /// warnings (5°, 10 mm).
    /// </summary>
    public static RegistrationOptions WithinExam() => new()
    {
        Preset = "within-exam",
        Initialization = InitializationKind.Identity,
        Levels = [new(4, 6000, 200, 1.0, 0.005), new(2, 20000, 200, 0.5, 0.002), new(1, 40000, 200, 0.25, 0.001)],
        CorrectBias = true,
        WarnRotationDeg = 5,
        WarnShiftMm = 10,
        MaxCenterDisplacementMm = 15,
    };

    /// <summary>The named preset; throws <see cref="InvalidParameterException"/> for an unknown name.</summary>
    public static RegistrationOptions ForPreset(string name) => name switch
    {
        "rigid" => Rigid(),
        "affine" => Affine(),
        "deformable" => Deformable(),
        "within-exam" => WithinExam(),
        _ => throw new InvalidParameterException($"unknown registration preset '{name}'", "preset",
            $"use one of: {string.Join(", ", PresetNames)}"),
    };
}
