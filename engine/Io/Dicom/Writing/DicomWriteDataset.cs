using System.Globalization;
using System.Text;

namespace Serimetry.Engine.Io.Dicom.Writing;

/// <summary>
/// A mutable data set to be written (PS3.5 section 7): elements kept in ascending tag order, values
/// encoded on add as Explicit VR Little Endian bytes with the even-length padding of PS3.5 6.2 (space for
/// text, NUL for UI and binary). Text of the VRs that use the Specific Character Set is UTF-8
/// (ISO_IR 192, declared by <see cref="DicomPart10Writer"/>).
/// </summary>
public sealed class DicomWriteDataset
{
    private readonly SortedDictionary<uint, DicomWriteElement> _elements = [];

    /// <summary>The elements in ascending tag order.</summary>
    public IEnumerable<DicomWriteElement> Elements => _elements.Values;

    /// <summary>True when the tag has been added.</summary>
    public bool Contains(DicomTag tag) => _elements.ContainsKey(tag.Value);

    /// <summary>Adds (or replaces) a text element; several values are joined with backslash (PS3.5 6.4).</summary>
    public DicomWriteDataset Add(DicomTag tag, DicomVR vr, params string[] values)
    {
        if (!vr.IsString()) throw new ArgumentException($"{vr.Code()} is not a text VR", nameof(vr));
        var text = vr.IsSingleValuedText() ? string.Concat(values) : string.Join('\\', values);
        byte[] bytes = vr.UsesSpecificCharacterSet() ? Encoding.UTF8.GetBytes(text) : Encoding.ASCII.GetBytes(text);
        return Put(tag, vr, Pad(bytes, vr == DicomVR.UI ? (byte)0 : (byte)' '));
    }

    /// <summary>Adds numbers: DS/IS as text (PS3.5 6.2: DS at most 16 characters), US/SS/UL/SL/FL/FD binary.</summary>
    public DicomWriteDataset Add(DicomTag tag, DicomVR vr, params double[] values) => vr switch
    {
        DicomVR.DS => Add(tag, vr, Array.ConvertAll(values, FormatDecimal)),
        DicomVR.IS => Add(tag, vr, Array.ConvertAll(values, v => checked((long)Math.Round(v)).ToString(CultureInfo.InvariantCulture))),
        DicomVR.US or DicomVR.SS or DicomVR.UL or DicomVR.SL or DicomVR.FL or DicomVR.FD => Put(tag, vr, Binary(vr, values)),
        _ => throw new ArgumentException($"{vr.Code()} is not a numeric VR", nameof(vr)),
    };

    /// <summary>
    /// The Image Pixel module attributes of an unsigned single-sample MONOCHROME2 image (PS3.3 C.7.6.3), with
    /// High Bit = Bits Stored − 1; Pixel Data itself is added by the caller.
    /// </summary>
    public DicomWriteDataset AddMonochromePixelModule(int rows, int columns, int bitsAllocated, int bitsStored) =>
        Add(DicomTags.SamplesPerPixel, DicomVR.US, 1)
            .Add(DicomTags.PhotometricInterpretation, DicomVR.CS, "MONOCHROME2")
            .Add(DicomTags.Rows, DicomVR.US, rows)
            .Add(DicomTags.Columns, DicomVR.US, columns)
            .Add(DicomTags.BitsAllocated, DicomVR.US, bitsAllocated)
            .Add(DicomTags.BitsStored, DicomVR.US, bitsStored)
            .Add(DicomTags.HighBit, DicomVR.US, bitsStored - 1)
            .Add(DicomTags.PixelRepresentation, DicomVR.US, 0);

    /// <summary>Adds raw little-endian bytes (OB, OW, OF, UN …); an odd length is padded with NUL.</summary>
    public DicomWriteDataset AddBytes(DicomTag tag, DicomVR vr, byte[] bytes) => Put(tag, vr, Pad(bytes, 0));

    /// <summary>Adds an Attribute Tag value (AT, PS3.5 6.2): group then element, each 16-bit little endian.</summary>
    public DicomWriteDataset AddTag(DicomTag tag, DicomTag value)
    {
        var b = new byte[4];
        BitConverter.TryWriteBytes(b.AsSpan(0, 2), value.Group);
        BitConverter.TryWriteBytes(b.AsSpan(2, 2), value.Element);
        return Put(tag, DicomVR.AT, b);
    }

    /// <summary>Adds a sequence (SQ) of item data sets; an empty list writes an empty sequence.</summary>
    public DicomWriteDataset AddSequence(DicomTag tag, params DicomWriteDataset[] items)
    {
        _elements[tag.Value] = new DicomWriteElement(tag, DicomVR.SQ, [], items);
        return this;
    }

    /// <summary>Copies every element of <paramref name="other"/> into this data set (items are shared, not cloned).</summary>
    public DicomWriteDataset CopyFrom(DicomWriteDataset other)
    {
        foreach (var e in other.Elements) _elements[e.Tag.Value] = e;
        return this;
    }

    /// <summary>Removes an element when present.</summary>
    public DicomWriteDataset Remove(DicomTag tag)
    {
        _elements.Remove(tag.Value);
        return this;
    }

    /// <summary>
    /// A DS value within 16 characters (PS3.5 table 6.2-1): shortest round-trip form when it fits, else
    /// fewer significant digits.
    /// </summary>
    public static string FormatDecimal(double v)
    {
        if (!double.IsFinite(v)) throw new ArgumentException("DS cannot hold NaN or infinity", nameof(v));
        var s = v.ToString("R", CultureInfo.InvariantCulture);
        for (int digits = 15; s.Length > 16 && digits > 1; digits--)
            s = v.ToString("G" + digits.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
        return s;
    }

    private DicomWriteDataset Put(DicomTag tag, DicomVR vr, byte[] value)
    {
        if (tag.Group == 0x0002) throw new ArgumentException("group 0002 is written by DicomPart10Writer", nameof(tag));
        if (!vr.HasLongLength() && value.Length > ushort.MaxValue)
            throw new ArgumentException($"{tag} {vr.Code()} value of {value.Length} bytes exceeds the 16-bit length", nameof(value));
        _elements[tag.Value] = new DicomWriteElement(tag, vr, value, null);
        return this;
    }

    private static byte[] Pad(byte[] b, byte pad)
    {
        if (b.Length % 2 == 0) return b;
        var p = new byte[b.Length + 1];
        b.CopyTo(p, 0);
        p[^1] = pad;
        return p;
    }

    private static byte[] Binary(DicomVR vr, double[] values)
    {
        int size = vr.ValueSize();
        var b = new byte[values.Length * size];
        for (int i = 0; i < values.Length; i++)
        {
            var s = b.AsSpan(i * size, size);
            _ = vr switch
            {
                DicomVR.US => BitConverter.TryWriteBytes(s, checked((ushort)values[i])),
                DicomVR.SS => BitConverter.TryWriteBytes(s, checked((short)values[i])),
                DicomVR.UL => BitConverter.TryWriteBytes(s, checked((uint)values[i])),
                DicomVR.SL => BitConverter.TryWriteBytes(s, checked((int)values[i])),
                DicomVR.FL => BitConverter.TryWriteBytes(s, (float)values[i]),
                _ => BitConverter.TryWriteBytes(s, values[i]),
            };
        }
        return b;
    }
}

/// <summary>One element to write: encoded value bytes, or the items of a sequence.</summary>
public sealed record DicomWriteElement(DicomTag Tag, DicomVR VR, byte[] Value, IReadOnlyList<DicomWriteDataset>? Items);
