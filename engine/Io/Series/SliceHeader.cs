using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Where one image (one frame) comes from: a file on disk, or an entry inside a zip archive, and the
/// frame number inside a multi-frame object.
/// </summary>
/// <param name="Container">The file path (or the .zip path when <paramref name="Entry"/> is set).</param>
/// <param name="Entry">The zip entry name, or null for a plain file.</param>
/// <param name="Frame">0-based frame index (0 for single-frame objects).</param>
public sealed record SliceSource(string Container, string? Entry = null, int Frame = 0)
{
    /// <summary>A short human-readable location (never contains patient identifiers unless the file name does).</summary>
    public string Describe() =>
        (Entry is null ? Container : $"{Container}!{Entry}") + (Frame > 0 ? $" frame {Frame + 1}" : "");
}

/// <summary>
/// What series assembly needs from one image or frame, read from the DICOM header only (no pixels).
/// Built from a parsed data set by the DICOM adapter, or directly in tests. Attribute
/// names and tags follow DICOM PS3.3 (General Series, Image Plane C.7.6.2, Image Pixel C.7.6.3,
/// MR Image C.8.3.1, Diffusion macro C.8.13.5.9). Null means absent.
/// </summary>
public sealed partial record SliceHeader
{
    public required SliceSource Source { get; init; }

    /// <summary>SOP Instance UID (0008,0018).</summary>
    public string? SopInstanceUid { get; init; }

    /// <summary>Series Instance UID (0020,000E).</summary>
    public string? SeriesInstanceUid { get; init; }

    /// <summary>Study Instance UID (0020,000D).</summary>
    public string? StudyInstanceUid { get; init; }

    /// <summary>Patient ID (0010,0020). PHI: shown only in user-requested output, never logged.</summary>
    public string? PatientId { get; init; }

    /// <summary>Study Date (0008,0020), DICOM DA (YYYYMMDD).</summary>
    public string? StudyDate { get; init; }

    /// <summary>Modality (0008,0060).</summary>
    public string? Modality { get; init; }

    /// <summary>Series Number (0020,0011).</summary>
    public int? SeriesNumber { get; init; }

    /// <summary>Instance Number (0020,0013); used only to break ties, never to order slices.</summary>
    public int? InstanceNumber { get; init; }

    /// <summary>Acquisition Number (0020,0012).</summary>
    public int? AcquisitionNumber { get; init; }

    /// <summary>Image Position (Patient) (0020,0032): LPS mm of the centre of the first transmitted pixel.</summary>
    public Vec3? ImagePositionPatient { get; init; }

    /// <summary>First three values of Image Orientation (Patient) (0020,0037): direction of increasing column index.</summary>
    public Vec3? RowCosine { get; init; }

    /// <summary>Last three values of Image Orientation (Patient) (0020,0037): direction of increasing row index.</summary>
    public Vec3? ColumnCosine { get; init; }

    /// <summary>Pixel Spacing (0028,0030) value 1: distance between rows (along the column cosine), mm.</summary>
    public double? RowSpacingMm { get; init; }

    /// <summary>Pixel Spacing (0028,0030) value 2: distance between columns (along the row cosine), mm.</summary>
    public double? ColumnSpacingMm { get; init; }

    /// <summary>Rows (0028,0010).</summary>
    public int Rows { get; init; }

    /// <summary>Columns (0028,0011).</summary>
    public int Columns { get; init; }

    /// <summary>Slice Thickness (0018,0050), mm. Not used for geometry.</summary>
    public double? SliceThicknessMm { get; init; }

    /// <summary>Spacing Between Slices (0018,0088), mm. Used only for single-slice stacks.</summary>
    public double? SpacingBetweenSlicesMm { get; init; }

    /// <summary>Image Type (0008,0008), or Frame Type (0008,9007) of an Enhanced MR frame; upper case.</summary>
    public IReadOnlyList<string> ImageType { get; init; } = [];

    /// <summary>Series Description (0008,103E).</summary>
    public string? SeriesDescription { get; init; }

    /// <summary>Sequence Name (0018,0024).</summary>
    public string? SequenceName { get; init; }

    /// <summary>Scanning Sequence (0018,0020), e.g. SE, EP, GR, IR.</summary>
    public IReadOnlyList<string> ScanningSequence { get; init; } = [];

    /// <summary>Sequence Variant (0018,0021).</summary>
    public IReadOnlyList<string> SequenceVariant { get; init; } = [];

    /// <summary>Scan Options (0018,0022).</summary>
    public IReadOnlyList<string> ScanOptions { get; init; } = [];

    /// <summary>Diffusion b-value (0018,9087), top level or from the MR Diffusion functional group (0018,9117).</summary>
    public double? DiffusionBValue { get; init; }

    /// <summary>Diffusion Directionality (0018,9075), e.g. ISOTROPIC, DIRECTIONAL, NONE.</summary>
    public string? DiffusionDirectionality { get; init; }

    /// <summary>Diffusion Gradient Orientation (0018,9089), when present.</summary>
    public Vec3? DiffusionGradient { get; init; }

    /// <summary>
    /// Siemens private b-value: element 0x0C of the block reserved by creator "SIEMENS MR HEADER" in group
    /// 0019 (usually (0019,100C)), as text (ASCII digits, possibly space-padded; seen with VR OB or IS).
    /// </summary>
    public string? SiemensBValueText { get; init; }

    /// <summary>Manufacturer (0008,0070).</summary>
    public string? Manufacturer { get; init; }

    /// <summary>Manufacturer's Model Name (0008,1090).</summary>
    public string? Model { get; init; }

    /// <summary>Magnetic Field Strength (0018,0087), tesla.</summary>
    public double? MagneticFieldStrengthT { get; init; }

    /// <summary>Repetition Time (0018,0080), ms.</summary>
    public double? RepetitionTimeMs { get; init; }

    /// <summary>Echo Time (0018,0081), ms.</summary>
    public double? EchoTimeMs { get; init; }

    /// <summary>Rescale Slope (0028,1053) (or Pixel Value Transformation (0028,9145)); 1 when absent.</summary>
    public double RescaleSlope { get; init; } = 1;

    /// <summary>Rescale Intercept (0028,1052); 0 when absent.</summary>
    public double RescaleIntercept { get; init; }

    /// <summary>Bits Allocated (0028,0100).</summary>
    public int BitsAllocated { get; init; }

    /// <summary>Bits Stored (0028,0101).</summary>
    public int BitsStored { get; init; }

    /// <summary>Pixel Representation (0028,0103): 0 unsigned, 1 signed.</summary>
    public int PixelRepresentation { get; init; }

    /// <summary>Samples per Pixel (0028,0002).</summary>
    public int SamplesPerPixel { get; init; } = 1;

    /// <summary>Number of Frames (0028,0008) of the object this frame belongs to.</summary>
    public int NumberOfFrames { get; init; } = 1;

    /// <summary>Transfer Syntax UID (0002,0010) of the file.</summary>
    public string? TransferSyntaxUid { get; init; }

    /// <summary>Slice normal n = row cosine × column cosine, or null without an orientation.</summary>
    public Vec3? Normal => RowCosine is { } r && ColumnCosine is { } c ? r.Cross(c) : null;
}
