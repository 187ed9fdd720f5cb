namespace Serimetry.Engine.Core;

/// <summary>
/// A spatial transform in physical space (LPS, mm). By the registration convention it maps a point of the
/// fixed (baseline) image to the corresponding point of the moving (follow-up) image, which is what
/// resampling the moving image onto the fixed grid needs.
/// </summary>
public interface ISpatialTransform
{
    /// <summary>Maps a fixed-space point (mm) to the moving-space point (mm).</summary>
    Vec3 TransformPoint(Vec3 fixedPointMm);
}
