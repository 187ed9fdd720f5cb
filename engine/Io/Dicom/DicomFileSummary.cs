using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>Statistics of the stored values of one frame (see <see cref="DicomFileSummary"/>).</summary>
/// <param name="Min">Smallest stored value.</param>
/// <param name="Max">Largest stored value.</param>
/// <param name="Mean">Mean stored value (all samples of all pixels).</param>
/// <param name="Sha256">SHA-256 (lower-case hex) of the stored values written as little-endian integers of Bits
/// Allocated width (one byte per pixel when Bits Allocated is 1), signed when Pixel Representation is 1.</param>
public sealed record DicomPixelStats(
    [property: JsonPropertyName("min")] long Min,
    [property: JsonPropertyName("max")] long Max,
    [property: JsonPropertyName("mean")] double Mean,
    [property: JsonPropertyName("sha256")] string Sha256);

/// <summary>
/// What <c>serimetry inspect FILE.dcm --json</c> reports for one DICOM file: transfer syntax, image
/// size, per-frame statistics of the stored values (no rescale) and key header values. Header values
/// come from the top level or, for multi-frame objects, the standard functional group macros.
/// </summary>
public sealed record DicomFileSummary(
    [property: JsonPropertyName("transferSyntaxUid")] string TransferSyntaxUid,
    [property: JsonPropertyName("transferSyntaxName")] string TransferSyntaxName,
    [property: JsonPropertyName("sopClassUid")] string? SopClassUid,
    [property: JsonPropertyName("modality")] string? Modality,
    [property: JsonPropertyName("rows")] int? Rows,
    [property: JsonPropertyName("columns")] int? Columns,
    [property: JsonPropertyName("frames")] int? Frames,
    [property: JsonPropertyName("bitsAllocated")] int? BitsAllocated,
    [property: JsonPropertyName("bitsStored")] int? BitsStored,
    [property: JsonPropertyName("pixelRepresentation")] int? PixelRepresentation,
    [property: JsonPropertyName("samplesPerPixel")] int? SamplesPerPixel,
    [property: JsonPropertyName("pixelStats")] IReadOnlyList<DicomPixelStats> PixelStats,
    [property: JsonPropertyName("headers")] IReadOnlyDictionary<string, string?> Headers,
    [property: JsonPropertyName("leniencies")] IReadOnlyList<string> Leniencies)
{
    /// <summary>The header attributes reported (keywords of PS3.6).</summary>
    public static readonly IReadOnlyList<DicomTag> HeaderTags =
    [
        DicomTags.PatientID, DicomTags.StudyInstanceUID, DicomTags.SeriesInstanceUID, DicomTags.SOPInstanceUID,
        DicomTags.ImagePositionPatient, DicomTags.ImageOrientationPatient, DicomTags.PixelSpacing,
        DicomTags.SliceThickness, DicomTags.RescaleSlope, DicomTags.RescaleIntercept,
    ];

    /// <summary>Reads a file and summarises it; pixel statistics need a supported transfer syntax (else <see cref="Core.UnsupportedInputException"/>).</summary>
    public static DicomFileSummary FromFile(string path, DicomReadOptions? options = null) =>
        FromDicomFile(DicomFile.ReadHeader(path, options));

    /// <summary>Summarises a file already read.</summary>
    public static DicomFileSummary FromDicomFile(DicomFile file)
    {
        var ds = file.Dataset;
        var stats = new List<DicomPixelStats>();
        if (file.HasPixelData && ds.Contains(DicomTags.Rows))
        {
            var px = file.GetPixelData();
            for (var f = 0; f < px.FrameCount; f++) stats.Add(ComputeStats(px, f));
        }
        var headers = new Dictionary<string, string?>();
        foreach (var tag in HeaderTags)
            headers[tag.Keyword!] = DicomFunctionalGroups.Find(ds, tag) is { } found ? found.Holder.GetString(tag) : null;
        var sop = ds.GetStringOrNull(DicomTags.SOPClassUID) ?? file.FileMeta.GetStringOrNull(DicomTags.MediaStorageSOPClassUID);
        return new DicomFileSummary(file.TransferSyntaxUid, file.TransferSyntax.Name, sop, ds.GetStringOrNull(DicomTags.Modality),
            ds.GetIntOrNull(DicomTags.Rows), ds.GetIntOrNull(DicomTags.Columns),
            ds.Contains(DicomTags.Rows) ? ds.GetIntOrNull(DicomTags.NumberOfFrames) ?? 1 : null,
            ds.GetIntOrNull(DicomTags.BitsAllocated), ds.GetIntOrNull(DicomTags.BitsStored),
            ds.GetIntOrNull(DicomTags.PixelRepresentation), ds.GetIntOrNull(DicomTags.SamplesPerPixel),
            stats, headers, file.Leniencies);
    }

    /// <summary>Statistics and hash of one frame's stored values (the convention of the reference manifest).</summary>
    public static DicomPixelStats ComputeStats(DicomPixelData px, int frame)
    {
        var values = px.GetStoredValues(frame);
        var info = px.Info;
        var unsigned32 = info.BitsAllocated == 32 && info.PixelRepresentation == 0;
        long min = long.MaxValue, max = long.MinValue;
        double sum = 0;
        var width = info.BitsAllocated == 1 ? 1 : info.BitsAllocated / 8;
        var bytes = new byte[values.Length * width];
        for (var i = 0; i < values.Length; i++)
        {
            long v = unsigned32 ? (uint)values[i] : values[i];
            if (v < min) min = v;
            if (v > max) max = v;
            sum += v;
            var raw = values[i];
            for (var b = 0; b < width; b++) bytes[i * width + b] = (byte)(raw >> (8 * b));
        }
        var hash = Convert.ToHexStringLower(SHA256.HashData(bytes));
        return new DicomPixelStats(min, max, values.Length == 0 ? 0 : sum / values.Length, hash);
    }

    /// <summary>The summary as JSON (camelCase names as declared).</summary>
    public string ToJson(bool indented = true) =>
        JsonSerializer.Serialize(this, new JsonSerializerOptions { WriteIndented = indented });

    /// <summary>The mean with 6 significant digits, as the reference manifest prints it.</summary>
    public static string FormatMean(double mean) => mean.ToString("G6", CultureInfo.InvariantCulture);
}
