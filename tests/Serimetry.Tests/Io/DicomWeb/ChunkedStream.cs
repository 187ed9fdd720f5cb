namespace Serimetry.Tests.Io.DicomWeb;

/// <summary>A read-only stream that hands out its bytes in chunks of given sizes (cycled), to split delimiters across reads.</summary>
internal sealed class ChunkedStream(byte[] data, params int[] chunkSizes) : Stream
{
    private int _pos;
    private int _next;

    public override int Read(byte[] buffer, int offset, int count)
    {
        int chunk = chunkSizes.Length == 0 ? count : chunkSizes[_next++ % chunkSizes.Length];
        int n = Math.Min(Math.Min(count, chunk), data.Length - _pos);
        Array.Copy(data, _pos, buffer, offset, n);
        _pos += n;
        return n;
    }

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => data.Length;
    public override long Position { get => _pos; set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
}
