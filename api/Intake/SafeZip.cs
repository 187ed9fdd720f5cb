using System.IO.Compression;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Api.Intake;

/// <summary>
/// Unpacks an uploaded .zip under the engine's <see cref="ZipLimits"/>: entry count, declared sizes and
/// compression ratio are checked from the central directory (APPNOTE.TXT §4.3.16) before inflating, inflation
/// stops at the declared size (a lying header cannot inflate further), and entry names that are rooted or climb
/// with ".." are refused (path traversal, CWE-22).
/// </summary>
internal static class SafeZip
{
    /// <summary>
    /// Inflates every file entry into <paramref name="targetDir"/> (as numbered files, so entry names never touch the
    /// disk) and returns them under their relative entry names (forward slashes).
    /// </summary>
    public static IReadOnlyList<IntakeFile> Extract(string zipPath, ZipLimits limits, string targetDir)
    {
        ZipArchive archive;
        try { archive = ZipFile.OpenRead(zipPath); }
        catch (InvalidDataException e)
        {
            throw new InputFormatException($"upload is not a readable zip archive: {e.Message}", "request body", "send a complete .zip", e);
        }
        using (archive)
        {
            if (archive.Entries.Count > limits.MaxEntries)
                throw new InputLimitException($"zip holds {archive.Entries.Count:N0} entries, more than {limits.MaxEntries:N0}", "request body", "split the upload");
            var files = archive.Entries.Where(e => !e.FullName.EndsWith('/')).ToList();
            long total = 0;
            foreach (var e in archive.Entries) CheckName(e.FullName);
            foreach (var e in files)
            {
                CheckSize(e, limits);
                total += e.Length;
                if (total > limits.MaxTotalBytes)
                    throw new InputLimitException($"zip declares more than {limits.MaxTotalBytes:N0} bytes uncompressed", "request body",
                        "this looks like a zip bomb; refusing it");
            }
            Directory.CreateDirectory(targetDir);
            return files.Select((e, i) =>
            {
                string path = Path.Combine(targetDir, i.ToString("D6", System.Globalization.CultureInfo.InvariantCulture));
                Inflate(e, path);
                return new IntakeFile(e.FullName.Replace('\\', '/'), path);
            }).ToList();
        }
    }

    private static void CheckName(string name)
    {
        var n = name.Replace('\\', '/');
        if (n.Length == 0 || n.StartsWith('/') || (n.Length > 1 && n[1] == ':') || n.Split('/').Any(p => p == ".."))
            throw new InputFormatException($"zip entry name '{name}' points outside the archive (path traversal)", "request body",
                "re-create the archive with relative entry names");
    }

    private static void CheckSize(ZipArchiveEntry e, ZipLimits limits)
    {
        if (e.Length > limits.MaxEntryBytes)
            throw new InputLimitException($"zip entry '{e.FullName}' declares {e.Length:N0} bytes, more than {limits.MaxEntryBytes:N0}", "request body",
                "this looks like a zip bomb; refusing it");
        if (e.Length >= limits.RatioCheckFromBytes && (double)e.Length / Math.Max(1, e.CompressedLength) > limits.MaxCompressionRatio)
            throw new InputLimitException($"zip entry '{e.FullName}' would inflate {e.CompressedLength:N0} to {e.Length:N0} bytes (ratio above {limits.MaxCompressionRatio})",
                "request body", "this looks like a zip bomb; refusing it");
    }

    /// <summary>Inflates one entry to <paramref name="path"/> through a fixed buffer, stopping one byte past its declared size.</summary>
    private static void Inflate(ZipArchiveEntry e, string path)
    {
        var buf = new byte[1 << 16];
        using var s = e.Open();
        using var f = File.Create(path);
        long written = 0;
        while (written <= e.Length)
        {
            int n = s.Read(buf, 0, (int)Math.Min(buf.Length, e.Length - written + 1));
            if (n == 0) break;
            f.Write(buf, 0, n);
            written += n;
        }
        if (written != e.Length)
            throw new InputLimitException($"zip entry '{e.FullName}' inflates to a size other than it declares", "request body", "refusing a corrupt or hostile archive");
    }
}
