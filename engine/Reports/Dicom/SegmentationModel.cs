using Serimetry.Engine.Core;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>A coded concept (PS3.3 8.8, Code Sequence Macro): value, scheme designator, meaning.</summary>
public sealed record DicomCode(string Value, string Scheme, string Meaning)
{
    /// <summary>SCT 91723000 "Anatomical Structure" (segmentation category; from memory, seen in SEG examples).</summary>
    public static readonly DicomCode AnatomicalStructure = new("91723000", "SCT", "Anatomical Structure");

    /// <summary>SCT 41216001 "Prostate" (from memory, matches public SNOMED CT listings of "Prostatic structure").</summary>
    public static readonly DicomCode Prostate = new("41216001", "SCT", "Prostate");

    /// <summary>SCT 49755003 "Morphologically Altered Structure" (segmentation category; from memory).</summary>
    public static readonly DicomCode MorphologicallyAlteredStructure = new("49755003", "SCT", "Morphologically Altered Structure");

    /// <summary>SCT 108369006 "Neoplasm" (from memory, matches public SNOMED CT listings of "Tumor").</summary>
    public static readonly DicomCode Neoplasm = new("108369006", "SCT", "Neoplasm");
}

/// <summary>One segment of a binary SEG (PS3.3 C.8.20.2, Segment Description Macro C.8.20.4).</summary>
/// <param name="Label">Segment Label (0062,0005).</param>
/// <param name="Category">Segmented Property Category Code.</param>
/// <param name="Type">Segmented Property Type Code.</param>
/// <param name="AlgorithmType">AUTOMATIC, SEMIAUTOMATIC or MANUAL (0062,0008).</param>
/// <param name="AlgorithmName">Segment Algorithm Name (0062,0009), required unless MANUAL.</param>
/// <param name="Mask">Mask on the source grid (non-zero = inside).</param>
/// <param name="TrackingId">Tracking ID (0062,0020): the same lesion keeps its ID across visits.</param>
public sealed record SegmentDefinition(string Label, DicomCode Category, DicomCode Type, string AlgorithmType, string? AlgorithmName,
    Volume<byte> Mask, string? TrackingId = null);

/// <summary>The source image series a SEG is derived from (one SOP Instance UID per slice, in grid slice order).</summary>
/// <param name="SeriesInstanceUid">Series Instance UID of the source images.</param>
/// <param name="SopClassUid">SOP Class UID of the source images.</param>
/// <param name="SopInstanceUids">Instance of slice k of the grid, k = 0 … Z−1.</param>
/// <param name="FrameOfReferenceUid">Frame of Reference UID of the source images.</param>
/// <param name="PatientName">Patient's Name of the source images, repeated so the SEG files under the same patient.</param>
/// <param name="StudyTime">Study Time (0008,0030) of the source images, repeated because the SEG joins their study.</param>
/// <param name="StudyId">Study ID (0020,0010) of the source images, repeated for the same reason.</param>
public sealed record SegSourceReference(string SeriesInstanceUid, string SopClassUid, IReadOnlyList<string> SopInstanceUids,
    string? FrameOfReferenceUid, string? PatientName = null, string? StudyTime = null, string? StudyId = null);

/// <summary>
/// Patient and study attributes the SEG, SR and RTSTRUCT repeat from their source study (PS3.3 C.7.1.1, C.7.2.1).
/// Study Time and Study ID are Type 2: written empty only when the source study has none (e.g. NIfTI exams).
/// </summary>
public sealed record DicomStudyInfo(string? PatientId, string? PatientName, string? StudyInstanceUid, DateOnly? StudyDate,
    string? StudyTime = null, string? StudyId = null);

/// <summary>The identifiers of a written object (for the SR's evidence and references).</summary>
public sealed record DicomObjectIds(string StudyInstanceUid, string SeriesInstanceUid, string SopClassUid, string SopInstanceUid)
{
    internal static DicomObjectIds Of(Io.Dicom.Writing.DicomWriteDataset ds)
    {
        string Get(Io.Dicom.DicomTag t) =>
            System.Text.Encoding.ASCII.GetString(ds.Elements.First(e => e.Tag == t).Value).TrimEnd('\0', ' ');
        return new(Get(Io.Dicom.DicomTags.StudyInstanceUID), Get(Io.Dicom.DicomTags.SeriesInstanceUID),
            Get(Io.Dicom.DicomTags.SOPClassUID), Get(Io.Dicom.DicomTags.SOPInstanceUID));
    }
}
