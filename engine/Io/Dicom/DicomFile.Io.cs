using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

public sealed partial class DicomFile
{
    private const int FirstChunk = 64 * 1024;

    private static DicomFile ReadHeaderCore(string path, DicomReadLog log)
    {
        using var fs = Open(path, log);
        var length = fs.Length;
        CheckSize(length, log);
        var buffer = new byte[(int)Math.Min(length, FirstChunk)];
        var filled = 0;
        while (true)
        {
            filled += ReadInto(fs, buffer, filled, log);
            // A short read means the file ended early (e.g. truncated while reading): parse what there is.
            var isPrefix = filled < length && filled == buffer.Length;
            try
            {
                var r = DicomFileParser.Parse(buffer.AsMemory(0, filled), isPrefix, true, log);
                return new DicomFile(log.Source, path, r, log, true);
            }
            catch (DicomNeedMoreDataException) when (isPrefix)
            {
                var next = (int)Math.Min(length, (long)buffer.Length * 4);
                Array.Resize(ref buffer, next);
            }
        }
    }

    /// <summary>Reads the file from the Pixel Data value to the end.</summary>
    private ReadOnlyMemory<byte> ReadTail(DicomPixelDataLocation loc)
    {
        using var fs = Open(FilePath!, _log);
        var remain = fs.Length - loc.Offset;
        if (remain < 0 || (!loc.Encapsulated && remain < loc.Length))
            throw new InputFormatException(
                $"Pixel Data declares {loc.Length} bytes at byte {loc.Offset} but the file now has {fs.Length} bytes",
                Source, "the file was truncated or changed after its header was read; read it again");
        var take = loc.Encapsulated ? remain : loc.Length;
        var buffer = new byte[take];
        fs.Seek(loc.Offset, SeekOrigin.Begin);
        var got = ReadInto(fs, buffer, 0, _log);
        return buffer.AsMemory(0, got);
    }

    private static byte[] ReadAllBytes(string path, DicomReadLog log)
    {
        using var fs = Open(path, log);
        CheckSize(fs.Length, log);
        var buffer = new byte[fs.Length];
        var got = ReadInto(fs, buffer, 0, log);
        return got == buffer.Length ? buffer : buffer[..got];
    }

    private static int ReadInto(FileStream fs, byte[] buffer, int offset, DicomReadLog log)
    {
        var total = 0;
        try
        {
            int n;
            while (offset + total < buffer.Length && (n = fs.Read(buffer, offset + total, buffer.Length - offset - total)) > 0)
                total += n;
        }
        catch (IOException ex)
        {
            throw new InputFormatException($"cannot read the file: {ex.Message}", log.Source, "check the storage and permissions", ex);
        }
        return total;
    }

    private static FileStream Open(string path, DicomReadLog log)
    {
        try
        {
            return new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1, FileOptions.SequentialScan);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new InputFormatException($"cannot open the file: {ex.Message}", log.Source,
                "check the path exists and is readable", ex);
        }
    }

    private static void CheckSize(long length, DicomReadLog log)
    {
        if (length > log.Options.MaxFileBytes)
            throw new InputLimitException($"the file has {length:N0} bytes, more than the limit of {log.Options.MaxFileBytes:N0}",
                log.Source, "DICOM files of this size are not supported");
    }
}
