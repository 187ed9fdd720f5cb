namespace Serimetry.Engine.Io.Masks;

/// <summary>The kinds of mask file Serimetry reads (docs/masks.md).</summary>
public enum MaskFormat
{
    /// <summary>NIfTI-1 label volume (.nii, .nii.gz); non-zero = inside.</summary>
    Nifti,

    /// <summary>DICOM Segmentation (PS3.3 A.51), BINARY or FRACTIONAL.</summary>
    DicomSeg,

    /// <summary>DICOM RT Structure Set (PS3.3 A.19) with CLOSED_PLANAR contours.</summary>
    RtStruct,
}
