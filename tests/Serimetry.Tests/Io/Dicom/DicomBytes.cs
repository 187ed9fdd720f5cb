using System.Text;

namespace Serimetry.Tests.Io.Dicom;

/// <summary>Builds small Part 10 byte images for tests (Explicit VR Little Endian unless told otherwise).</summary>
internal sealed class DicomBytes
{
    private readonly MemoryStream _ms = new();
    private readonly BinaryWriter _w;

    public DicomBytes() => _w = new BinaryWriter(_ms);

    /// <summary>Preamble, "DICM" and a File Meta group naming <paramref name="transferSyntax"/>.</summary>
    public static DicomBytes Part10(string transferSyntax = "1.2.840.10008.1.2.1")
    {
        var b = new DicomBytes();
        b._w.Write(new byte[128]);
        b._w.Write("DICM"u8);
        b.Element(0x0002, 0x0001, "OB", [0, 1]);
        b.Element(0x0002, 0x0010, "UI", Ui(transferSyntax));
        return b;
    }

    public DicomBytes Element(ushort group, ushort element, string vr, byte[] value)
    {
        Header(group, element, vr, (uint)value.Length);
        _w.Write(value);
        return this;
    }

    public DicomBytes Header(ushort group, ushort element, string vr, uint length)
    {
        _w.Write(group);
        _w.Write(element);
        _w.Write(Encoding.ASCII.GetBytes(vr));
        if (vr is "OB" or "OW" or "SQ" or "UN" or "UT" or "UC" or "UR" or "OD" or "OF" or "OL" or "OV" or "SV" or "UV")
        {
            _w.Write((ushort)0);
            _w.Write(length);
        }
        else _w.Write((ushort)length);
        return this;
    }

    /// <summary>An item or delimiter tag with a 32-bit length.</summary>
    public DicomBytes Item(ushort element, uint length)
    {
        _w.Write((ushort)0xFFFE);
        _w.Write(element);
        _w.Write(length);
        return this;
    }

    public DicomBytes Raw(byte[] bytes)
    {
        _w.Write(bytes);
        return this;
    }

    public DicomBytes US(ushort group, ushort element, params ushort[] values) =>
        Element(group, element, "US", values.SelectMany(BitConverter.GetBytes).ToArray());

    public DicomBytes Text(ushort group, ushort element, string vr, string text) => Element(group, element, vr, Padded(text));

    public byte[] ToArray()
    {
        _w.Flush();
        return _ms.ToArray();
    }

    public static byte[] Padded(string text) => Pad(Encoding.ASCII.GetBytes(text), (byte)' ');

    public static byte[] Ui(string uid) => Pad(Encoding.ASCII.GetBytes(uid), 0);

    public static byte[] Pad(byte[] b, byte pad) => b.Length % 2 == 0 ? b : [.. b, pad];
}
