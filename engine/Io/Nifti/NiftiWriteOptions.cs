namespace Serimetry.Engine.Io.Nifti;

/// <summary>Meaning of a written qform/sform (nifti1.h NIFTI_XFORM_* codes).</summary>
public enum NiftiXformCode
{
    /// <summary>NIFTI_XFORM_SCANNER_ANAT (1): scanner-based anatomical coordinates, e.g. an image converted from DICOM.</summary>
    Scanner = 1,

    /// <summary>NIFTI_XFORM_ALIGNED_ANAT (2): coordinates aligned to another image, e.g. a registered or resampled result.</summary>
    Aligned = 2,
}

/// <summary>How <see cref="NiftiFile"/> writes a dataset.</summary>
/// <param name="XformCode">Code written to both qform_code and sform_code.</param>
/// <param name="Version">1 (348-byte header, the default, read by every tool) or 2 (540-byte header).</param>
/// <param name="Compress">gzip the file; null decides from the extension (.nii.gz compresses).</param>
public sealed record NiftiWriteOptions(
    NiftiXformCode XformCode = NiftiXformCode.Scanner,
    int Version = 1,
    bool? Compress = null)
{
    public static readonly NiftiWriteOptions Default = new();
}
