using System.Buffers.Binary;
using System.IO.Compression;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// A forward-only byte source over a .nii or .nii.gz file (gzip detected from its magic bytes 1F 8B,
/// RFC 1952), counting the decompressed position so truncation and oversize streams are reported with
/// byte counts. Never reads more than asked, so a gzip bomb costs at most what the header declares.
/// </summary>
internal sealed class NiftiSource : IDisposable
{
    private readonly FileStream _file;
    private readonly Stream _stream;

    private NiftiSource(FileStream file, Stream stream, bool compressed, string where)
    {
        _file = file;
        _stream = stream;
        IsCompressed = compressed;
        Where = where;
    }

    public bool IsCompressed { get; }

    public string Where { get; }

    /// <summary>Decompressed bytes consumed so far.</summary>
    public long Position { get; private set; }

    /// <summary>Length of the file on disk (compressed length for .nii.gz).</summary>
    public long FileLength => _file.Length;

    public static NiftiSource Open(string path)
    {
        if (!File.Exists(path))
            throw new InputFormatException("file not found", path, "check the path");
        var file = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        try
        {
            Span<byte> magic = stackalloc byte[2];
            int n = file.Read(magic);
            file.Position = 0;
            bool gz = n == 2 && magic[0] == 0x1F && magic[1] == 0x8B;
            Stream s = gz ? new GZipStream(file, CompressionMode.Decompress, leaveOpen: true) : file;
            return new NiftiSource(file, s, gz, path);
        }
        catch
        {
            file.Dispose();
            throw;
        }
    }

    /// <summary>Reads exactly <paramref name="buffer"/>.Length bytes or throws a truncation error naming <paramref name="what"/>.</summary>
    public void ReadExactly(Span<byte> buffer, string what)
    {
        int got = ReadUpTo(buffer);
        if (got < buffer.Length)
            throw new InputFormatException(
                $"the file ends inside the {what}: {Position:N0} bytes{(IsCompressed ? " after decompression" : "")}, {buffer.Length - got:N0} more expected",
                Where, "the file is truncated; copy or export it again");
    }

    /// <summary>Reads as many bytes as are available up to the buffer length.</summary>
    public int ReadUpTo(Span<byte> buffer)
    {
        int total = 0;
        try
        {
            while (total < buffer.Length)
            {
                int n = _stream.Read(buffer[total..]);
                if (n == 0) break;
                total += n;
            }
        }
        catch (InvalidDataException e)
        {
            throw new InputFormatException($"the gzip stream is corrupt ({e.Message})", Where, "the file is damaged; copy or export it again", e);
        }
        Position += total;
        return total;
    }

    /// <summary>Discards <paramref name="count"/> bytes (reading through them when compressed).</summary>
    public void Skip(long count, string what)
    {
        if (count <= 0) return;
        if (!IsCompressed && Position + count <= _file.Length)
        {
            _file.Seek(count, SeekOrigin.Current);
            Position += count;
            return;
        }
        var scratch = new byte[(int)Math.Min(count, 1 << 16)];
        while (count > 0)
        {
            var chunk = scratch.AsSpan(0, (int)Math.Min(count, scratch.Length));
            ReadExactly(chunk, what);
            count -= chunk.Length;
        }
    }

    /// <summary>How many bytes follow the current position, counting at most <paramref name="limit"/> + 1.</summary>
    public long CountRemaining(long limit)
    {
        var scratch = new byte[1 << 16];
        long total = 0;
        while (total <= limit)
        {
            int n = ReadUpTo(scratch);
            if (n == 0) break;
            total += n;
        }
        return total;
    }

    /// <summary>
    /// For a gzip file read to its end: checks the trailer's ISIZE (decompressed length mod 2^32, RFC 1952 §2.3.1)
    /// against the bytes decompressed. A stream cut inside its last block or trailer can decompress without an
    /// error; this check catches it. Multi-member (block) gzip files are refused by it too.
    /// </summary>
    public void CheckGzipTrailer()
    {
        if (!IsCompressed) return;
        Span<byte> trailer = stackalloc byte[4];
        if (_file.Length >= 18)
        {
            _file.Seek(-4, SeekOrigin.End);
            _file.ReadExactly(trailer);
            if (BinaryPrimitives.ReadUInt32LittleEndian(trailer) == (uint)Position) return;
        }
        throw new InputFormatException(
            $"the gzip stream is truncated or damaged: its trailer does not record the {Position:N0} bytes that were decompressed",
            Where, "copy or export the file again (multi-member gzip files must be recompressed with plain gzip)");
    }

    public void Dispose()
    {
        if (!ReferenceEquals(_stream, _file)) _stream.Dispose();
        _file.Dispose();
    }
}
