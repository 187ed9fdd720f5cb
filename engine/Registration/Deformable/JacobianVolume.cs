using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration;

/// <summary>Volume change read from a deformation's Jacobian determinant.</summary>
public static class JacobianVolume
{
    /// <summary>
    /// ∫_mask det(∂T/∂x) dx / ∫_mask dx over the mask's voxels (sampled at voxel centres): the volume the
    /// masked region occupies in the moving image divided by its volume in the fixed image. With a baseline
    /// gland mask and the baseline → follow-up deformation, this is the follow-up gland volume as a fraction
    /// of the baseline volume (includes the bulk transform's det, 1 for rigid). Throws
    /// <see cref="InvalidParameterException"/> for an empty mask.
    /// </summary>
    public static double JacobianVolumeChange(BSplineDeformation deformation, Volume<byte> mask)
    {
        ArgumentNullException.ThrowIfNull(deformation);
        ArgumentNullException.ThrowIfNull(mask);
        var m = mask.Voxels;
        var g = mask.Geometry;
        int nx = g.Size.X, nxy = nx * g.Size.Y;
        double sum = 0;
        long n = 0;
        for (int idx = 0; idx < m.Length; idx++)
        {
            if (m[idx] == 0) continue;
            int k = idx / nxy, r = idx - k * nxy, j = r / nx, i = r - j * nx;
            sum += deformation.JacobianDeterminant(g.IndexToPhysical(i, j, k));
            n++;
        }
        if (n == 0) throw new InvalidParameterException("the mask is empty", "mask", "a mask with at least one voxel set");
        return sum / n;
    }

    /// <summary>
    /// How much volume change the free-form part alone puts on the masked region (the lesion):
    /// <see cref="JacobianVolumeChange"/> divided by the bulk transform's det. 1.0 = nothing absorbed; 1.6 means
    /// the deformation itself expands the region by 60 %, change a lesion measurement after alignment no longer sees.
    /// </summary>
    public static double AbsorbedChange(BSplineDeformation deformation, Volume<byte> mask)
    {
        ArgumentNullException.ThrowIfNull(deformation);
        return JacobianVolumeChange(deformation, mask) / deformation.Bulk.Linear.Determinant;
    }
}
