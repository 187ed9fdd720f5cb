using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Concept codes of the measurement report. DCM codes are from PS3.16 annex D, SCT and UCUM codes as used by
/// TID 1500/1411 (from memory unless noted). Measures without a standard code use our own coding scheme
/// designator <see cref="Scheme"/> ("99SRMT": PS3.3 8.2 reserves designators beginning with "99" for private
/// or local coding schemes), whose code value is the measure id of change.json (docs/dicom-out.md lists them).
/// </summary>
internal static class SrCodes
{
    /// <summary>Our local coding scheme designator.</summary>
    public const string Scheme = "99SRMT";

    /// <summary>
    /// The item of the Coding Scheme Identification Sequence (0008,0110; PS3.3 C.12.1.1.2) declaring our private scheme:
    /// designator, name, version (= the change.json schema version, whose measure ids are the code values) and
    /// responsible organization. The scheme is not registered, so Coding Scheme Registry (0008,0112) is absent, and
    /// no Coding Scheme UID (0008,010C) has been assigned to it (both Type 1C).
    /// </summary>
    public static DicomWriteDataset SchemeIdentification() => new DicomWriteDataset()
        .Add(DicomTags.CodingSchemeDesignator, DicomVR.SH, Scheme)
        .Add(DicomTags.CodingSchemeVersion, DicomVR.SH, ChangeReportJson.SchemaVersion)
        .Add(DicomTags.CodingSchemeName, DicomVR.ST, "Serimetry measures (measure ids of change.json, docs/dicom-out.md)")
        .Add(DicomTags.CodingSchemeResponsibleOrganization, DicomVR.ST, "Serimetry project");

    public static readonly DicomCode MeasurementReport = new("126000", "DCM", "Imaging Measurement Report");
    public static readonly DicomCode Language = new("121049", "DCM", "Language of Content Item and Descendants");
    public static readonly DicomCode English = new("eng", "RFC5646", "English");
    public static readonly DicomCode ObserverType = new("121005", "DCM", "Observer Type");
    public static readonly DicomCode Device = new("121007", "DCM", "Device");
    public static readonly DicomCode DeviceObserverUid = new("121012", "DCM", "Device Observer UID");
    public static readonly DicomCode DeviceObserverName = new("121013", "DCM", "Device Observer Name");
    public static readonly DicomCode ProcedureReported = new("121058", "DCM", "Procedure reported");
    public static readonly DicomCode ProstateMri = new("719178004", "SCT", "Multiparametric MRI of prostate");
    public static readonly DicomCode ImagingMeasurements = new("126010", "DCM", "Imaging Measurements");
    public static readonly DicomCode MeasurementGroup = new("125007", "DCM", "Measurement Group");
    public static readonly DicomCode TrackingIdentifier = new("112039", "DCM", "Tracking Identifier");
    public static readonly DicomCode TrackingUid = new("112040", "DCM", "Tracking Unique Identifier");
    public static readonly DicomCode Finding = new("121071", "DCM", "Finding");
    public static readonly DicomCode FindingSite = new("363698007", "SCT", "Finding Site");
    public static readonly DicomCode ReferencedSegment = new("121191", "DCM", "Referenced Segment");
    public static readonly DicomCode TimePoint = new("C2348792", "UMLS", "Time Point");
    public static readonly DicomCode Volume = new("118565006", "SCT", "Volume");
    public static readonly DicomCode Adc = new("113041", "DCM", "Apparent Diffusion Coefficient");
    public static readonly DicomCode Derivation = new("121401", "DCM", "Derivation");
    public static readonly DicomCode Mean = new("373098007", "SCT", "Mean");
    public static readonly DicomCode Median = new("260528009", "SCT", "Median");
    public static readonly DicomCode StandardDeviation = new("386136009", "SCT", "Standard Deviation");

    /// <summary>The concept and optional derivation modifier of a change.json measure id.</summary>
    public static (DicomCode Concept, DicomCode? Derivation) ForMeasure(string id) => id switch
    {
        "gland.volume" or "lesion.volume" => (Volume, null),
        "lesion.adc.mean" => (Adc, Mean),
        "lesion.adc.median" => (Adc, Median),
        "lesion.adc.sd" => (Adc, StandardDeviation),
        _ => (Local(id), null),
    };

    /// <summary>A code of our scheme: value = the id (SH: at most 16 characters, so long ids are shortened by a stable hash).</summary>
    public static DicomCode Local(string id) => new(id.Length <= 16 ? id : ShortId(id), Scheme, id);

    /// <summary>The UCUM code of a change.json unit (PS3.16 uses UCUM for measurement units).</summary>
    public static DicomCode Unit(string unit) => unit switch
    {
        "mL" => new("ml", "UCUM", "milliliter"),
        "mm" => new("mm", "UCUM", "millimeter"),
        "10^-6 mm2/s" => new("um2/s", "UCUM", "um2/s"),
        "1" or "" => new("1", "UCUM", "no units"),
        "ng/mL" => new("ng/ml", "UCUM", "ng/ml"),
        "ng/mL2" => new("ng/ml/ml", "UCUM", "ng/ml/ml"),
        "%" => new("%", "UCUM", "percent"),
        _ => new(unit, "UCUM", unit),
    };

    private static string ShortId(string id)
    {
        uint h = 2166136261;
        foreach (char c in id) h = (h ^ c) * 16777619;
        return id[..7] + "~" + h.ToString("X8", System.Globalization.CultureInfo.InvariantCulture);
    }
}
