namespace Serimetry.Engine.Registration;

/// <summary>
/// The B-spline stage of the <c>deformable</c> preset, run after the bulk (rigid/affine) stage on the same
/// (bias-corrected, mask-cropped) images. Metric: gain-matched mean squares normalised by the fixed variance
/// (same-contrast follow-up T2w). Objective = metric + <see cref="BendingWeightMm2"/> · bending energy (mm⁻²)
/// + <see cref="FoldingPenaltyWeight"/> · folding guard, so the bending weight is in mm². Each level's <see cref="RegistrationLevel.MaxStepMm"/> caps the L-BFGS step
/// (Euclidean norm over all coefficients, mm).
/// </summary>
public sealed record BSplineStageOptions
{
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

    /// <summary>Pyramid levels of the B-spline stage (coarse to fine).</summary>
    public IReadOnlyList<RegistrationLevel> Levels { get; init; } =
    [
        new(2, 20000, 60, 4.0, 0.01),
        new(1, 30000, 60, 2.0, 0.005),
    ];
}
