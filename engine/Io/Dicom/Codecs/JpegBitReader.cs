namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// Reads entropy-coded bits of a T.81 scan: most significant bit first, a 0x00 after 0xFF is a stuffed byte
/// (T.81 F.1.2.3), any other byte after 0xFF is a marker that ends the segment. Past a marker or the end the
/// reader supplies zero bits for look-ahead only; consuming one of them means the data was truncated.
/// </summary>
internal ref struct JpegBitReader
{
    private readonly ReadOnlySpan<byte> _data;
    private readonly string _codec;
    private int _pos;
    private ulong _buffer;   // unread bits, left-aligned
    private int _bits;       // unread bits in _buffer, padding included
    private int _padBits;    // zero bits appended past the end of the segment (always the lowest)
    private bool _ended;

    public JpegBitReader(ReadOnlySpan<byte> data, int start, string codec)
    {
        _data = data;
        _pos = start;
        _codec = codec;
    }

    /// <summary>Offset of the next byte not yet taken into the bit buffer.</summary>
    public readonly int Position => _pos;

    private void Fill()
    {
        while (_bits <= 56)
        {
            int value = 0;
            if (!_ended)
            {
                if (_pos >= _data.Length) _ended = true;
                else if (_data[_pos] != 0xFF) value = _data[_pos++];
                else if (_pos + 1 < _data.Length && _data[_pos + 1] == 0x00) { value = 0xFF; _pos += 2; }
                else _ended = true;
            }
            if (_ended) _padBits += 8;
            _buffer |= (ulong)value << (56 - _bits);
            _bits += 8;
        }
    }

    /// <summary>The next <paramref name="count"/> (1..32) bits without consuming them.</summary>
    public int Peek(int count)
    {
        if (_bits < count) Fill();
        return (int)(_buffer >> (64 - count));
    }

    /// <summary>The next 32 bits without consuming them (zero bits past the end of the segment).</summary>
    public uint Peek32()
    {
        if (_bits < 32) Fill();
        return (uint)(_buffer >> 32);
    }

    public void Skip(int count)
    {
        _buffer <<= count;
        _bits -= count;
        if (_bits < _padBits)
            throw CodecErrors.Malformed(_codec, "the entropy-coded data ends before the last sample of the scan", _pos);
    }

    /// <summary>Reads <paramref name="count"/> bits (0..24) as an unsigned number.</summary>
    public int Read(int count)
    {
        if (count == 0) return 0;
        int value = Peek(count);
        Skip(count);
        return value;
    }

    /// <summary>
    /// Ends a restart interval (T.81 E.2.4 / F.2.2.5): drops the bits padding the last byte and expects
    /// the marker RSTn with n = <paramref name="index"/> modulo 8 next.
    /// </summary>
    public void ReadRestartMarker(int index)
    {
        Fill();
        int realBits = _bits - _padBits;
        if (!_ended || realBits >= 8)
            throw CodecErrors.Malformed(_codec, $"expected restart marker RST{index & 7} but more entropy-coded data follows", _pos);
        int at = _pos;
        while (at + 1 < _data.Length && _data[at + 1] == 0xFF) at++;
        int expected = JpegMarkerReader.Rst0 + (index & 7);
        if (at + 1 >= _data.Length || _data[at] != 0xFF || _data[at + 1] != expected)
            throw CodecErrors.Malformed(_codec, $"expected restart marker RST{index & 7} (0xFF{expected:X2})", at);
        _pos = at + 2;
        _buffer = 0;
        _bits = 0;
        _padBits = 0;
        _ended = false;
    }

    /// <summary>Offset of the marker that follows the scan's entropy-coded data (or the end of the data).</summary>
    public readonly int FindNextMarker()
    {
        for (int at = _pos; at + 1 < _data.Length; at++)
        {
            if (_data[at] != 0xFF) continue;
            int code = _data[at + 1];
            if (code != 0x00 && code != 0xFF && (code < 0xD0 || code > 0xD7)) return at;
        }
        return _data.Length;
    }
}
