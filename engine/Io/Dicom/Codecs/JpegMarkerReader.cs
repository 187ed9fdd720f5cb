namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// Walks the marker segments of a JPEG (ITU-T T.81 B.1) or JPEG-LS (ITU-T T.87 C.1) codestream: a marker is
/// 0xFF followed by a code, optionally preceded by 0xFF fill bytes (T.81 B.1.1.2); most markers carry a
/// big-endian 16-bit length that counts itself. Every read is bounds-checked.
/// </summary>
internal ref struct JpegMarkerReader
{
    public const int Soi = 0xD8, Eoi = 0xD9, Sos = 0xDA, Dht = 0xC4, Dri = 0xDD, Dnl = 0xDC;
    public const int Sof3 = 0xC3, SofLs = 0xF7, Lse = 0xF8, Rst0 = 0xD0;

    private readonly ReadOnlySpan<byte> _data;
    private readonly string _codec;

    public JpegMarkerReader(ReadOnlySpan<byte> data, string codec)
    {
        _data = data;
        _codec = codec;
    }

    /// <summary>Offset of the next unread byte.</summary>
    public int Position { get; set; }

    public readonly bool AtEnd => Position >= _data.Length;

    /// <summary>Reads the next marker code (the byte after 0xFF, fill bytes skipped).</summary>
    public int ReadMarker()
    {
        if (Position >= _data.Length || _data[Position] != 0xFF)
            throw CodecErrors.Malformed(_codec, Position >= _data.Length ? "the codestream ends before its EOI marker" :
                $"expected a marker (0xFF) but found 0x{_data[Position]:X2}", Position);
        while (Position < _data.Length && _data[Position] == 0xFF) Position++;
        if (Position >= _data.Length)
            throw CodecErrors.Malformed(_codec, "the codestream ends inside a marker", Position);
        return _data[Position++];
    }

    /// <summary>Reads a length-prefixed marker segment and returns its payload (after the two length bytes).</summary>
    public ReadOnlySpan<byte> ReadSegment(int marker)
    {
        if (Position + 2 > _data.Length)
            throw CodecErrors.Malformed(_codec, $"marker 0xFF{marker:X2} has no length field", Position);
        int length = (_data[Position] << 8) | _data[Position + 1];
        if (length < 2 || Position + length > _data.Length)
            throw CodecErrors.Malformed(_codec, $"marker 0xFF{marker:X2} declares {length} bytes but {_data.Length - Position} remain", Position);
        var payload = _data.Slice(Position + 2, length - 2);
        Position += length;
        return payload;
    }

    /// <summary>Big-endian 16-bit value from a segment payload, bounds-checked.</summary>
    public readonly int U16(ReadOnlySpan<byte> payload, int at, int segmentStart)
    {
        if (at + 2 > payload.Length) throw CodecErrors.Malformed(_codec, "a marker segment is shorter than its fields", segmentStart + at);
        return (payload[at] << 8) | payload[at + 1];
    }

    /// <summary>One byte from a segment payload, bounds-checked.</summary>
    public readonly int U8(ReadOnlySpan<byte> payload, int at, int segmentStart)
    {
        if (at >= payload.Length) throw CodecErrors.Malformed(_codec, "a marker segment is shorter than its fields", segmentStart + at);
        return payload[at];
    }
}
