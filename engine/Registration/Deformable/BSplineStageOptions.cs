namespace Serimetry.Engine.Registration;

/// <summary>
/// The B-spline stage of the <c>deformable</c> preset, run after the bulk (rigid/affine) stage on the same
/// (bias-corrected, mask-cropped) images. Metric: gain-matched mean squares normalised by the fixed variance
/// (same-contrast follow-up T2w) or Mattes mutual information (<see cref="Metric"/>). Objective = metric + <see cref="BendingWeightMm2"/> · bending energy (mm⁻²)
/// + <see cref="FoldingPenaltyWeight"/> · folding guard, so the bending weight is in mm². Each level's <see cref="RegistrationLevel.MaxStepMm"/> caps the L-BFGS step
/// (Euclidean norm over all coefficients, mm).
/// </summary>
public sealed record BSplineStageOptions
{
    /// <summary>
    /// The stage's similarity metric: <see cref="MetricKind.MeanSquares"/> (gain-matched, normalised) or
    /// <see cref="MetricKind.MattesMutualInformation"/> (the registration's <see cref="RegistrationOptions.HistogramBins"/>).
    /// Null (default) chooses per image pair: mean squares when the fixed and moving intensities correlate
    /// (Pearson r ≥ <see cref="SameContrastCorrelation"/>) at the bulk result, i.e. the same contrast, else mutual information.
    /// </summary>
    public MetricKind? Metric { get; init; }

    /// <summary>Correlation of fixed and bulk-aligned moving intensities from which the pair counts as one contrast.</summary>
    public double SameContrastCorrelation { get; init; } = 0.5;

    /// <summary>Control point spacing (mm, all axes). 10–15 mm resolves gland-scale shape change.</summary>
    public double GridSpacingMm { get; init; } = 12;

    /// <summary>Weight of the bending energy (mm²); larger is stiffer, 0 is none.</summary>
    public double BendingWeightMm2 { get; init; } = 50;

    /// <summary>
    /// Folding guard: weight of mean max(0, <see cref="MinJacobian"/> − det J)² over the control-point positions
    /// (0 switches it off). Inactive while every local volume ratio stays above <see cref="MinJacobian"/>.
    /// </summary>
    public double FoldingPenaltyWeight { get; init; } = 1;

    /// <summary>Local volume ratio below which the folding guard acts.</summary>
    public double MinJacobian { get; init; } = 0.5;

    /// <summary>
    /// With a lesion mask: keep the deformation from absorbing lesion change. The lesion grown by
    /// <see cref="LesionMarginMm"/> is left out of the metric's samples (its appearance may change between visits), so
    /// the deformation there is the smooth continuation of the surrounding tissue's and re-fitting on the
    /// follow-up measures the growth.
    /// </summary>
    public bool ProtectLesion { get; init; } = true;

    /// <summary>Margin (mm, box) by which the lesion is grown before it is left out of the samples.</summary>
    public double LesionMarginMm { get; init; } = 5;

    /// <summary>
    /// Weight of an extra lesion term, mean over the lesion of (det ∂T/∂x / det A − 1)² (dimensionless; default 0 =
    /// off). It holds the lesion's volume even when growth outruns the margin, but also where the surrounding tissue
    /// truly compresses: on the 10 %-compression phantom weight 1 measured the ×2.0 growth as ×1.88, the exclusion
    /// alone as ×1.97.
    /// </summary>
    public double LesionJacobianWeight { get; init; }

    /// <summary>Pyramid levels of the B-spline stage (coarse to fine).</summary>
    public IReadOnlyList<RegistrationLevel> Levels { get; init; } =
    [
        new(2, 20000, 60, 4.0, 0.01),
        new(1, 30000, 60, 2.0, 0.005),
    ];
}
