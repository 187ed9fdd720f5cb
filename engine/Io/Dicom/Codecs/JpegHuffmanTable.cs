namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// A Huffman table from a DHT segment (T.81 B.2.4.2) with the code generation of T.81 Annex C and the
/// decoding of F.2.2.3 (MINCODE/MAXCODE/VALPTR), plus a 9-bit look-up for the short codes.
/// </summary>
internal sealed class JpegHuffmanTable
{
    private const int LookupBits = 9;
    private readonly ushort[] _lookup = new ushort[1 << LookupBits]; // (length << 8) | value; 0 = longer code
    private readonly int[] _maxCode = new int[18];
    private readonly int[] _valuePointer = new int[17];
    private readonly int[] _minCode = new int[17];
    private readonly byte[] _values;

    private JpegHuffmanTable(ReadOnlySpan<byte> counts, ReadOnlySpan<byte> values, string codec, int offset)
    {
        _values = values.ToArray();
        int code = 0, k = 0;
        for (int length = 1; length <= 16; length++)
        {
            int n = counts[length - 1];
            _valuePointer[length] = k;
            _minCode[length] = code;
            code += n;
            k += n;
            _maxCode[length] = n == 0 ? -1 : code - 1;
            if (code > (1 << length))
                throw CodecErrors.Malformed(codec, $"the Huffman table has more codes of length {length} than fit", offset);
            code <<= 1;
        }
        _maxCode[17] = int.MaxValue;
        BuildLookup();
    }

    private void BuildLookup()
    {
        for (int length = 1; length <= LookupBits; length++)
        {
            for (int i = 0; _maxCode[length] >= 0 && _minCode[length] + i <= _maxCode[length]; i++)
            {
                int codeValue = _minCode[length] + i;
                int spread = LookupBits - length;
                ushort entry = (ushort)((length << 8) | _values[_valuePointer[length] + i]);
                for (int fill = 0; fill < 1 << spread; fill++) _lookup[(codeValue << spread) | fill] = entry;
            }
        }
    }

    /// <summary>Parses one table (class/id byte, 16 counts, values) at <paramref name="at"/>; returns the bytes used.</summary>
    public static JpegHuffmanTable Parse(ReadOnlySpan<byte> payload, int at, string codec, int offset, out int tableClass, out int id, out int used)
    {
        if (at + 17 > payload.Length) throw CodecErrors.Malformed(codec, "a DHT segment is shorter than its 16 code counts", offset + at);
        tableClass = payload[at] >> 4;
        id = payload[at] & 15;
        if (id > 3) throw CodecErrors.Malformed(codec, $"Huffman table id {id} (expected 0..3)", offset + at);
        var counts = payload.Slice(at + 1, 16);
        int total = 0;
        foreach (byte c in counts) total += c;
        if (total > 256 || at + 17 + total > payload.Length)
            throw CodecErrors.Malformed(codec, $"the DHT segment declares {total} code values that it does not hold", offset + at);
        used = 17 + total;
        return new JpegHuffmanTable(counts, payload.Slice(at + 17, total), codec, offset + at);
    }

    /// <summary>
    /// DECODE of T.81 F.2.2.3 on a 16-bit window: the symbol whose code starts it and the code's length;
    /// no match is a format error.
    /// </summary>
    public int Match(int window16, out int length, string codec, int position)
    {
        int entry = _lookup[window16 >> (16 - LookupBits)];
        if (entry != 0)
        {
            length = entry >> 8;
            return entry & 0xFF;
        }
        for (length = LookupBits + 1; length <= 16; length++)
        {
            int code = window16 >> (16 - length);
            if (_maxCode[length] >= 0 && code <= _maxCode[length]) return _values[_valuePointer[length] + code - _minCode[length]];
        }
        throw CodecErrors.Malformed(codec, "a bit pattern matches no code of the Huffman table", position);
    }
}
