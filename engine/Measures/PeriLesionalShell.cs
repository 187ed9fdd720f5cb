using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;

namespace Serimetry.Engine.Measures;

/// <summary>
/// The peri-lesional shell used by the conspicuity measures: voxels of the gland, outside the lesion,
/// whose centre lies within <c>d</c> mm (Euclidean, physical space) of some lesion voxel centre. Built by
/// stamping an ellipsoidal index-space structuring element (all offsets whose physical length is ≤ d,
/// so anisotropic and oblique grids are handled exactly) around every lesion voxel.
/// </summary>
internal static class PeriLesionalShell
{
    /// <summary>A byte mask (1 = shell) on the grid shared by <paramref name="lesion"/> and <paramref name="gland"/>.</summary>
    public static byte[] Build(Volume<byte> lesion, Volume<byte> gland, double distanceMm)
    {
        lesion.Geometry.RequireCongruent(gland.Geometry, "lesion and gland masks");
        return MaskOps.Subtract(MaskOps.And(MaskOps.Dilate(lesion, distanceMm), gland), lesion).Voxels;
    }
}
