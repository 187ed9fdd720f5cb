using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Reads slice headers with the engine's DICOM Part 10 parser: files header-only (reading stops before
/// Pixel Data), zip entries from memory. Objects without Pixel Data or image size are skipped with a reason.
/// </summary>
public sealed class DicomSliceHeaderReader(DicomReadOptions? options = null) : ISliceHeaderReader
{
    public static readonly DicomSliceHeaderReader Default = new();

    public SliceReadResult ReadFile(string path) => FromFile(DicomFile.ReadHeader(path, options), new SliceSource(path));

    public SliceReadResult ReadBytes(byte[] bytes, SliceSource source) =>
        FromFile(DicomFile.Read(bytes, options, source.Entry ?? source.Container), source);

    private static SliceReadResult FromFile(DicomFile file, SliceSource source)
    {
        if (!file.HasPixelData) return SliceReadResult.Skip("no image (no Pixel Data): " + SopClassName(file));
        var ds = file.Dataset;
        if (!ds.Contains(DicomTags.Rows) || !ds.Contains(DicomTags.Columns))
            return SliceReadResult.Skip("no image (Rows/Columns missing)");
        return new SliceReadResult(SliceHeader.FromDataset(ds, source, file.TransferSyntaxUid), null);
    }

    private static string SopClassName(DicomFile file)
    {
        var uid = file.Dataset.GetStringOrNull(DicomTags.SOPClassUID)?.Trim() ?? file.FileMeta.GetStringOrNull(DicomTags.MediaStorageSOPClassUID)?.Trim();
        return uid is null ? "unknown object" : $"SOP Class {uid}";
    }
}
