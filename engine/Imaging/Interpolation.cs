namespace Serimetry.Engine.Imaging;

/// <summary>How an image is sampled between voxel centres.</summary>
public enum Interpolation
{
    /// <summary>The value of the nearest voxel centre (ties round up).</summary>
    Nearest,

    /// <summary>Trilinear interpolation of the 8 surrounding voxels; reproduces linear functions exactly.</summary>
    Linear,

    /// <summary>
    /// Cubic B-spline interpolation: coefficients from the recursive prefilter of Unser, Aldroubi &amp; Eden
    /// (IEEE PAMI 13(3), 1991) with mirror boundaries (Thévenaz, Blu &amp; Unser, IEEE TMI 2000),
    /// then the 4x4x4 cubic B-spline kernel. Interpolating (passes through the voxel values), reproduces
    /// polynomials up to degree 3 away from the borders.
    /// </summary>
    CubicBSpline,
}

/// <summary>How a mask (label volume) is resampled.</summary>
public enum MaskInterpolation
{
    /// <summary>Nearest neighbour: keeps label values unchanged; suitable for label maps.</summary>
    Nearest,

    /// <summary>
    /// For a binary mask (one non-zero label): trilinear interpolation of the 0/1 indicator, then the voxel is
    /// inside when the value is at least 0.5, as IBSI recommends for ROI interpolation (IBSI 1 reference
    /// manual, "Interpolation"; facts.md §8).
    /// </summary>
    LinearThreshold,
}
