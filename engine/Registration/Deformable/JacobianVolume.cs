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
}
