using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// A DICOM Part 10 file (PS3.10 section 7) read into raw elements: File Meta Information, the data
/// set, and its Pixel Data either in memory (<see cref="Read(string, DicomReadOptions?)"/>) or located
/// and read on demand (<see cref="ReadHeader"/>). Malformed input raises <see cref="InputException"/>s only.
/// </summary>
public sealed partial class DicomFile
{
    private readonly DicomReadLog _log;
    private readonly ReadOnlyMemory<byte> _dataSetBuffer;
    private readonly bool _pixelsInBuffer;
    private readonly Lock _lock = new();
    private DicomPixelData? _pixels;

    private DicomFile(string source, string? path, DicomFileParser.Result r, DicomReadLog log, bool headerOnly)
    {
        Source = source;
        FilePath = path;
        FileMeta = r.Meta;
        Dataset = r.Dataset;
        TransferSyntax = r.TransferSyntax;
        HasFileMeta = r.HasFileMeta;
        PixelDataLocation = r.PixelData;
        IsHeaderOnly = headerOnly;
        _log = log;
        // Inflated data sets exist only in memory: keep them so Pixel Data can be read later.
        _pixelsInBuffer = !headerOnly || r.Inflated;
        _dataSetBuffer = r.Inflated && headerOnly ? r.DataSetBuffer : ReadOnlyMemory<byte>.Empty;
    }

    /// <summary>The file name (or stream description) used in messages.</summary>
    public string Source { get; }

    /// <summary>The path when read from a file.</summary>
    public string? FilePath { get; }

    /// <summary>File Meta Information (group 0002); empty when the file has none.</summary>
    public DicomDataset FileMeta { get; }

    /// <summary>The data set. After <see cref="ReadHeader"/> it stops before Pixel Data.</summary>
    public DicomDataset Dataset { get; }

    /// <summary>The transfer syntax from the File Meta, or the one detected for a bare data set.</summary>
    public DicomTransferSyntax TransferSyntax { get; }

    /// <summary>Convenience: <see cref="TransferSyntax"/>'s UID.</summary>
    public string TransferSyntaxUid => TransferSyntax.Uid;

    /// <summary>True when File Meta Information was present.</summary>
    public bool HasFileMeta { get; }

    /// <summary>True when read by <see cref="ReadHeader"/>.</summary>
    public bool IsHeaderOnly { get; }

    /// <summary>Where the top-level Pixel Data (7FE0,0010) is; null when the file has none.</summary>
    public DicomPixelDataLocation? PixelDataLocation { get; }

    /// <summary>True when the data set has top-level Pixel Data.</summary>
    public bool HasPixelData => PixelDataLocation is not null;

    /// <summary>Deviations from the standard that the reader accepted (see <see cref="DicomReadOptions.Strict"/>).</summary>
    public IReadOnlyList<string> Leniencies => _log.Items;

    /// <summary>Reads a whole file into memory.</summary>
    public static DicomFile Read(string path, DicomReadOptions? options = null)
    {
        var log = new DicomReadLog(options ?? DicomReadOptions.Default, Path.GetFileName(path));
        var bytes = ReadAllBytes(path, log);
        return Guarded(log, () => new DicomFile(log.Source, path, DicomFileParser.Parse(bytes, false, false, log), log, false));
    }

    /// <summary>
    /// Reads everything up to the top-level Pixel Data (7FE0,0010) and records its location; the pixels
    /// are read on demand by <see cref="GetPixelData"/>. Reads the file in growing chunks, so indexing
    /// thousands of files touches only their headers.
    /// </summary>
    public static DicomFile ReadHeader(string path, DicomReadOptions? options = null)
    {
        var log = new DicomReadLog(options ?? DicomReadOptions.Default, Path.GetFileName(path));
        return Guarded(log, () => ReadHeaderCore(path, log));
    }

    /// <summary>Reads a whole stream (from its current position) into memory.</summary>
    public static DicomFile Read(Stream stream, DicomReadOptions? options = null, string source = "stream")
    {
        ArgumentNullException.ThrowIfNull(stream);
        var log = new DicomReadLog(options ?? DicomReadOptions.Default, source);
        using var ms = new MemoryStream();
        var chunk = new byte[81920];
        int n;
        while ((n = stream.Read(chunk, 0, chunk.Length)) > 0)
        {
            if (ms.Length + n > log.Options.MaxFileBytes)
                throw new InputLimitException($"the stream exceeds {log.Options.MaxFileBytes:N0} bytes", source,
                    "DICOM files of this size are not supported");
            ms.Write(chunk, 0, n);
        }
        var data = ms.GetBuffer().AsMemory(0, (int)ms.Length);
        return Guarded(log, () => new DicomFile(source, null, DicomFileParser.Parse(data, false, false, log), log, false));
    }

    /// <summary>Reads a file image held in memory (the memory is referenced, not copied).</summary>
    public static DicomFile Read(ReadOnlyMemory<byte> data, DicomReadOptions? options = null, string source = "memory")
    {
        var log = new DicomReadLog(options ?? DicomReadOptions.Default, source);
        return Guarded(log, () => new DicomFile(source, null, DicomFileParser.Parse(data, false, false, log), log, false));
    }

    /// <summary>
    /// The Pixel Data with its image attributes, read from the file now if this is a header-only read.
    /// Throws <see cref="UnsupportedInputException"/> for transfer syntaxes without a decoder.
    /// </summary>
    public DicomPixelData GetPixelData()
    {
        lock (_lock)
            return _pixels ??= Guarded(_log, LoadPixelData);
    }

    private DicomPixelData LoadPixelData()
    {
        if (PixelDataLocation is not { } loc)
            throw new InputFormatException("the data set has no Pixel Data (7FE0,0010)", Source,
                "this object holds no image; choose an image file");
        if (!IsHeaderOnly)
        {
            var e = Dataset.Get(new DicomTag(0x7FE0, 0x0010));
            return new DicomPixelData(Dataset, TransferSyntax, e.Value, e.Fragments, loc.VR, _log);
        }
        if (_pixelsInBuffer) return FromBuffer(_dataSetBuffer, loc);
        return FromBuffer(ReadTail(loc), loc with { Offset = 0 });
    }

    private DicomPixelData FromBuffer(ReadOnlyMemory<byte> buffer, DicomPixelDataLocation loc)
    {
        if (loc.Encapsulated)
        {
            var p = new DicomParser(buffer, _log, false) { Position = (int)loc.Offset };
            var fragments = p.ParseFragments(new DicomTag(0x7FE0, 0x0010), buffer.Length);
            return new DicomPixelData(Dataset, TransferSyntax, ReadOnlyMemory<byte>.Empty, fragments, loc.VR, _log);
        }
        if (loc.Offset + loc.Length > buffer.Length)
            throw new InputFormatException($"Pixel Data declares {loc.Length} bytes but the file ends after {buffer.Length - loc.Offset}",
                Source, "the file is truncated; copy it again from the source");
        return new DicomPixelData(Dataset, TransferSyntax, buffer.Slice((int)loc.Offset, (int)loc.Length), null, loc.VR, _log);
    }

    private static T Guarded<T>(DicomReadLog log, Func<T> read)
    {
        try
        {
            return read();
        }
        catch (Exception ex) when (ex is ArgumentException or IndexOutOfRangeException or OverflowException
                                       or InvalidDataException or DicomNeedMoreDataException)
        {
            // Defence in depth: every length is checked before use, but a malformed file must never
            // surface as anything other than an input error.
            throw new InputFormatException($"malformed DICOM data ({ex.GetType().Name}: {ex.Message})", log.Source,
                "the file is truncated or corrupt; copy it again from the source", ex);
        }
    }
}
