using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// A NIfTI dataset as read: one or more 3D volumes (float32, after scl_slope/scl_inter) on one LPS
/// geometry, the header as stored, which mapping placed it in space, and anything unusual found.
/// </summary>
/// <param name="Volumes">The volumes read, in file order (one for a 3D file or a chosen volume).</param>
/// <param name="Header">The header fields as stored (RAS world).</param>
/// <param name="GeometrySource">"sform", "qform" or "pixdim" (nifti1.h methods 3, 2, 1).</param>
/// <param name="FirstVolumeIndex">Index (along dim[4..7]) of <c>Volumes[0]</c> in the file.</param>
/// <param name="VolumeCount">Number of 3D volumes the file holds.</param>
/// <param name="Warnings">Leniencies and oddities (shear removed, qform/sform disagreement, unknown orientation …).</param>
public sealed record NiftiImage(
    IReadOnlyList<Volume<float>> Volumes,
    NiftiHeader Header,
    string GeometrySource,
    int FirstVolumeIndex,
    int VolumeCount,
    IReadOnlyList<string> Warnings)
{
    /// <summary>The first volume read (the only one for 3D files).</summary>
    public Volume<float> Volume => Volumes[0];

    /// <summary>The LPS geometry shared by all volumes.</summary>
    public Geometry Geometry => Volumes[0].Geometry;
}
