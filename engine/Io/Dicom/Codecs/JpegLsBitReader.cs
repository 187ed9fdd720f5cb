using System.Numerics;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// Reads the coded bits of a JPEG-LS scan (ITU-T T.87 A.1 and 9.1): most significant bit first; after a
/// 0xFF byte the encoder stuffs a 0 bit, so the next byte carries 7 bits; 0xFF followed by a byte with its high
/// bit set is a marker and ends the scan data. Past the end the reader supplies zero bits for look-ahead only;
/// consuming one of them means the data was truncated.
/// </summary>
internal ref struct JpegLsBitReader
{
    private const string Codec = "JPEG-LS";
    private readonly ReadOnlySpan<byte> _data;
    private int _pos;
    private ulong _buffer;   // unread bits, left-aligned
    private int _bits;       // unread bits in _buffer, padding included
    private int _padBits;    // zero bits appended past the end of the scan data (always the lowest)
    private bool _ended;

    public JpegLsBitReader(ReadOnlySpan<byte> data, int start)
    {
        _data = data;
        _pos = start;
    }

    public readonly int Position => _pos;

    private void Fill()
    {
        while (_bits <= 48)
        {
            if (!_ended && _pos < _data.Length && _data[_pos] != 0xFF)
            {
                _buffer |= (ulong)_data[_pos++] << (56 - _bits);
                _bits += 8;
            }
            else if (!_ended && _pos + 1 < _data.Length && _data[_pos] == 0xFF && _data[_pos + 1] < 0x80)
            {
                _buffer |= 0xFFUL << (56 - _bits);
                _bits += 8;
                _buffer |= (ulong)(_data[_pos + 1] & 0x7F) << (57 - _bits);
                _bits += 7;
                _pos += 2;
            }
            else
            {
                _ended = true;
                _padBits += 8;
                _bits += 8;
            }
        }
    }

    public int Read(int count)
    {
        if (count == 0) return 0;
        if (_bits < count) Fill();
        int value = (int)(_buffer >> (64 - count));
        Skip(count);
        return value;
    }

    public bool ReadBit() => Read(1) != 0;

    /// <summary>Counts 0 bits up to the next 1 bit (consumed); more than <paramref name="maxZeros"/> zeros is an error.</summary>
    public int ReadUnary(int maxZeros)
    {
        int count = 0;
        while (true)
        {
            if (_bits < 33) Fill();
            int zeros = Math.Min(32, BitOperations.LeadingZeroCount(_buffer));
            if (zeros < 32)
            {
                count += zeros;
                if (count > maxZeros) break;
                Skip(zeros + 1);
                return count;
            }
            count += 32;
            Skip(32);
            if (count > maxZeros) break;
        }
        throw CodecErrors.Malformed(Codec, $"a Golomb code has more than {maxZeros} leading zero bits (T.87 A.5.3 limit)", _pos);
    }

    private void Skip(int count)
    {
        _buffer <<= count;
        _bits -= count;
        if (_bits < _padBits)
            throw CodecErrors.Malformed(Codec, "the scan data ends before the last sample", _pos);
    }

    /// <summary>Offset of the marker after the scan data (0xFF followed by a byte of 0x80 or more), or the end.</summary>
    public readonly int FindNextMarker()
    {
        for (int at = _pos; at + 1 < _data.Length; at++)
            if (_data[at] == 0xFF && _data[at + 1] >= 0x80) return at;
        return _data.Length;
    }
}
