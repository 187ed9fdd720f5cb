using System.IO.Compression;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Reads the entries of a .zip archive one by one into memory under <see cref="ZipLimits"/>: the entry
/// count, declared sizes and compression ratios are checked from the central directory before any entry
/// is inflated, and inflation stops as soon as an entry exceeds what it declared. Entry names that climb
/// out of the archive (".." or rooted) are refused.
/// </summary>
internal sealed class ZipReader : IDisposable
{
    private readonly ZipArchive _archive;
    private readonly string _path;
    private readonly ZipLimits _limits;

    public ZipReader(string path, ZipLimits limits)
    {
        _path = path;
        _limits = limits;
        try
        {
            _archive = ZipFile.OpenRead(path);
        }
        catch (InvalidDataException e)
        {
            throw new InputFormatException($"not a readable zip archive: {e.Message}", path, "check the file is a complete .zip", e);
        }
        CheckDirectory();
    }

    /// <summary>The file entries (folders excluded) in name order.</summary>
    public IReadOnlyList<ZipArchiveEntry> Entries { get; private set; } = [];

    private void CheckDirectory()
    {
        int count = _archive.Entries.Count;
        if (count > _limits.MaxEntries)
            throw new InputLimitException($"zip archive holds {count:N0} entries, more than the limit of {_limits.MaxEntries:N0}",
                _path, "split the archive, or index the unpacked folder");
        long total = 0;
        var files = new List<ZipArchiveEntry>(count);
        foreach (var e in _archive.Entries)
        {
            CheckName(e.FullName);
            if (e.FullName.EndsWith('/') || e.FullName.EndsWith('\\')) continue;
            CheckEntrySize(e);
            total += e.Length;
            if (total > _limits.MaxTotalBytes)
                throw new InputLimitException(
                    $"zip archive declares more than {_limits.MaxTotalBytes:N0} bytes uncompressed in total", _path,
                    "this looks like a zip bomb or an archive far larger than one patient's exams; unpack and check it");
            files.Add(e);
        }
        files.Sort((a, b) => string.CompareOrdinal(a.FullName, b.FullName));
        Entries = files;
    }

    private void CheckName(string name)
    {
        var n = name.Replace('\\', '/');
        if (n.StartsWith('/') || (n.Length > 1 && n[1] == ':') || n.Split('/').Any(p => p == ".."))
            throw new InputFormatException($"zip entry name '{name}' points outside the archive (path traversal)", _path,
                "refusing the archive; re-create it with relative entry names");
    }

    private void CheckEntrySize(ZipArchiveEntry e)
    {
        if (e.Length > _limits.MaxEntryBytes)
            throw new InputLimitException(
                $"zip entry '{e.FullName}' declares {e.Length:N0} bytes uncompressed, more than the per-entry limit of {_limits.MaxEntryBytes:N0}",
                _path, "this looks like a zip bomb; no DICOM slice is that large");
        if (e.Length >= _limits.RatioCheckFromBytes && (double)e.Length / Math.Max(1, e.CompressedLength) > _limits.MaxCompressionRatio)
            throw new InputLimitException(
                $"zip entry '{e.FullName}' would inflate {e.CompressedLength:N0} bytes to {e.Length:N0} (ratio above {_limits.MaxCompressionRatio})",
                _path, "this looks like a zip bomb; refusing to inflate it");
    }

    /// <summary>Inflates one entry, reading at most its declared size (a longer stream is an error).</summary>
    public byte[] ReadEntry(ZipArchiveEntry e) => Guard(e, () => ReadEntryCore(e));

    /// <summary>Reads the first bytes of an entry for a quick format check.</summary>
    public byte[] ReadHead(ZipArchiveEntry e, int count) => Guard(e, () => ReadHeadCore(e, count));

    /// <summary>Corrupt compressed data surfaces as <see cref="InvalidDataException"/>; report it as bad input.</summary>
    private T Guard<T>(ZipArchiveEntry e, Func<T> read)
    {
        try
        {
            return read();
        }
        catch (InvalidDataException ex)
        {
            throw new InputFormatException($"zip entry '{e.FullName}' is corrupt: {ex.Message}", _path,
                "re-create the archive, or index the unpacked folder", ex);
        }
    }

    private byte[] ReadEntryCore(ZipArchiveEntry e)
    {
        var buffer = new byte[e.Length];
        using var s = e.Open();
        int n = s.ReadAtLeast(buffer, buffer.Length, throwOnEndOfStream: false);
        if (n < buffer.Length)
            throw new InputFormatException($"zip entry '{e.FullName}' ended after {n:N0} of its declared {e.Length:N0} bytes", _path);
        if (s.ReadByte() >= 0)
            throw new InputLimitException($"zip entry '{e.FullName}' inflates to more than its declared {e.Length:N0} bytes", _path,
                "the archive's sizes are forged (zip bomb); refusing it");
        return buffer;
    }

    private static byte[] ReadHeadCore(ZipArchiveEntry e, int count)
    {
        var buffer = new byte[(int)Math.Min(count, e.Length)];
        using var s = e.Open();
        int n = s.ReadAtLeast(buffer, buffer.Length, throwOnEndOfStream: false);
        return buffer[..n];
    }

    public void Dispose() => _archive.Dispose();
}
