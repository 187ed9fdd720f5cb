using System.Buffers.Binary;
using System.Text;

namespace Serimetry.Engine.Io.Dicom.Writing;

/// <summary>Options of <see cref="DicomPart10Writer"/>.</summary>
/// <param name="UndefinedLengthSequences">
/// Write sequences and items with undefined length and delimitation items (PS3.5 7.5.1) instead of explicit lengths.
/// </param>
public sealed record DicomWriteOptions(bool UndefinedLengthSequences = false);

/// <summary>
/// Writes DICOM Part 10 files (PS3.10 section 7): 128-byte preamble, "DICM", File Meta Information group
/// 0002 (PS3.10 7.1, always Explicit VR Little Endian, with its group length (0002,0000)) and the data set in
/// Explicit VR Little Endian (transfer syntax 1.2.840.10008.1.2.1, PS3.5 A.2). Specific Character Set
/// (0008,0005) is set to ISO_IR 192 (UTF-8) unless the data set declares one.
/// </summary>
public static class DicomPart10Writer
{
    /// <summary>Explicit VR Little Endian (PS3.5 A.2).</summary>
    public const string ExplicitVrLittleEndian = "1.2.840.10008.1.2.1";

    /// <summary>Writes the file atomically (temporary file then rename) and returns its path.</summary>
    public static string Write(string path, DicomWriteDataset dataset, DicomWriteOptions? options = null)
    {
        var bytes = ToBytes(dataset, options);
        var tmp = path + ".tmp";
        File.WriteAllBytes(tmp, bytes);
        File.Move(tmp, path, overwrite: true);
        return path;
    }

    /// <summary>
    /// The file's bytes. The data set must hold SOP Class UID (0008,0016) and SOP Instance UID (0008,0018),
    /// which the File Meta repeats as (0002,0002) and (0002,0003).
    /// </summary>
    public static byte[] ToBytes(DicomWriteDataset dataset, DicomWriteOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(dataset);
        options ??= new DicomWriteOptions();
        if (!dataset.Contains(DicomTags.SpecificCharacterSet)) dataset.Add(DicomTags.SpecificCharacterSet, DicomVR.CS, "ISO_IR 192");
        string sopClass = Uid(dataset, DicomTags.SOPClassUID);
        string sopInstance = Uid(dataset, DicomTags.SOPInstanceUID);
        using var ms = new MemoryStream();
        WriteFilePrefix(ms, sopClass, sopInstance, ExplicitVrLittleEndian);
        WriteDataset(ms, dataset, options);
        return ms.ToArray();
    }

    /// <summary>
    /// Writes the start of a Part 10 file: 128-byte preamble, "DICM" and the File Meta Information (PS3.10 7.1)
    /// naming <paramref name="transferSyntaxUid"/>. The caller appends a data set already encoded in that
    /// transfer syntax (e.g. one received over the network, PS3.8, whose encoding was negotiated).
    /// </summary>
    public static void WriteFilePrefix(Stream s, string sopClassUid, string sopInstanceUid, string transferSyntaxUid)
    {
        ArgumentNullException.ThrowIfNull(s);
        s.Write(new byte[128]);
        s.Write("DICM"u8);
        WriteMeta(s, sopClassUid, sopInstanceUid, transferSyntaxUid);
    }

    private static string Uid(DicomWriteDataset ds, DicomTag tag)
    {
        var e = ds.Elements.FirstOrDefault(x => x.Tag == tag)
            ?? throw new ArgumentException($"the data set needs {tag} {tag.Keyword} to be written as a Part 10 file");
        return Encoding.ASCII.GetString(e.Value).TrimEnd('\0', ' ');
    }

    private static void WriteMeta(Stream s, string sopClass, string sopInstance, string transferSyntax)
    {
        // PS3.10 7.1 table 7.1-1: group 0002 elements; (0002,0000) holds the byte count after itself.
        var meta = new DicomMetaBuilder();
        meta.Bytes(DicomTags.FileMetaInformationVersion, DicomVR.OB, [0, 1]);
        meta.Text(DicomTags.MediaStorageSOPClassUID, DicomVR.UI, sopClass);
        meta.Text(DicomTags.MediaStorageSOPInstanceUID, DicomVR.UI, sopInstance);
        meta.Text(DicomTags.TransferSyntaxUID, DicomVR.UI, transferSyntax);
        meta.Text(DicomTags.ImplementationClassUID, DicomVR.UI, DicomUids.ImplementationClassUid);
        meta.Text(DicomTags.ImplementationVersionName, DicomVR.SH, DicomUids.ImplementationVersionName);
        var body = meta.ToArray();
        var lengthElement = new byte[12];
        WriteHeader(lengthElement, DicomTags.FileMetaInformationGroupLength, DicomVR.UL, 4);
        BinaryPrimitives.WriteUInt32LittleEndian(lengthElement.AsSpan(8), (uint)body.Length);
        s.Write(lengthElement);
        s.Write(body);
    }

    internal static void WriteDataset(Stream s, DicomWriteDataset ds, DicomWriteOptions o)
    {
        foreach (var e in ds.Elements) WriteElement(s, e, o);
    }

    private static void WriteElement(Stream s, DicomWriteElement e, DicomWriteOptions o)
    {
        if (e.Items is null)
        {
            Span<byte> h = stackalloc byte[12];
            int n = WriteHeader(h, e.Tag, e.VR, (uint)e.Value.Length);
            s.Write(h[..n]);
            s.Write(e.Value);
            return;
        }
        if (o.UndefinedLengthSequences)
        {
            WriteRaw(s, e.Tag, DicomVR.SQ, 0xFFFFFFFF);
            foreach (var item in e.Items)
            {
                WriteItemTag(s, DicomTag.Item, 0xFFFFFFFF);
                WriteDataset(s, item, o);
                WriteItemTag(s, DicomTag.ItemDelimitation, 0);
            }
            WriteItemTag(s, DicomTag.SequenceDelimitation, 0);
            return;
        }
        var items = e.Items.Select(i =>
        {
            using var m = new MemoryStream();
            WriteDataset(m, i, o);
            return m.ToArray();
        }).ToList();
        long total = items.Sum(b => 8L + b.Length);
        WriteRaw(s, e.Tag, DicomVR.SQ, checked((uint)total));
        foreach (var b in items)
        {
            WriteItemTag(s, DicomTag.Item, (uint)b.Length);
            s.Write(b);
        }
    }

    private static void WriteRaw(Stream s, DicomTag tag, DicomVR vr, uint length)
    {
        Span<byte> h = stackalloc byte[12];
        int n = WriteHeader(h, tag, vr, length);
        s.Write(h[..n]);
    }

    private static void WriteItemTag(Stream s, DicomTag tag, uint length)
    {
        // PS3.5 7.5: item and delimitation tags carry no VR, just a 32-bit length.
        Span<byte> h = stackalloc byte[8];
        BinaryPrimitives.WriteUInt16LittleEndian(h, tag.Group);
        BinaryPrimitives.WriteUInt16LittleEndian(h[2..], tag.Element);
        BinaryPrimitives.WriteUInt32LittleEndian(h[4..], length);
        s.Write(h);
    }

    /// <summary>Explicit VR element header (PS3.5 7.1.2): 8 bytes, or 12 for the long-length VRs.</summary>
    internal static int WriteHeader(Span<byte> h, DicomTag tag, DicomVR vr, uint length)
    {
        BinaryPrimitives.WriteUInt16LittleEndian(h, tag.Group);
        BinaryPrimitives.WriteUInt16LittleEndian(h[2..], tag.Element);
        h[4] = (byte)((ushort)vr >> 8);
        h[5] = (byte)((ushort)vr & 0xFF);
        if (vr.HasLongLength())
        {
            h[6] = 0;
            h[7] = 0;
            BinaryPrimitives.WriteUInt32LittleEndian(h[8..], length);
            return 12;
        }
        BinaryPrimitives.WriteUInt16LittleEndian(h[6..], checked((ushort)length));
        return 8;
    }

    private sealed class DicomMetaBuilder
    {
        private readonly MemoryStream _s = new();

        public void Text(DicomTag tag, DicomVR vr, string value)
        {
            var b = Encoding.ASCII.GetBytes(value);
            if (b.Length % 2 == 1) b = [.. b, vr == DicomVR.UI ? (byte)0 : (byte)' '];
            Bytes(tag, vr, b);
        }

        public void Bytes(DicomTag tag, DicomVR vr, byte[] value)
        {
            Span<byte> h = stackalloc byte[12];
            int n = WriteHeader(h, tag, vr, (uint)value.Length);
            _s.Write(h[..n]);
            _s.Write(value);
        }

        public byte[] ToArray() => _s.ToArray();
    }
}
