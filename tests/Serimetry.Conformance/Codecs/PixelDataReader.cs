using System.Buffers.Binary;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// Test-only access to the Pixel Data (7FE0,0010) of Explicit VR Little Endian files, enough to feed the
/// codecs without the engine's DICOM parser: native bytes for defined-length data, and the frames of
/// encapsulated data (PS3.5 A.4: items (FFFE,E000), the first being the Basic Offset Table).
/// </summary>
internal static class PixelDataReader
{
    private static ReadOnlySpan<byte> Tag => [0xE0, 0x7F, 0x10, 0x00];

    /// <summary>Offset of the value-length field of the top-level Pixel Data element, and whether it is undefined.</summary>
    private static (int ValueStart, uint Length) Locate(byte[] file)
    {
        // The image's Pixel Data is the last (7FE0,0010) in the file; an icon's would come earlier.
        for (int at = file.AsSpan().LastIndexOf(Tag); at >= 0; at = file.AsSpan(0, at).LastIndexOf(Tag))
        {
            if (at + 12 > file.Length) continue;
            bool vrOk = file[at + 4] == 'O' && (file[at + 5] == 'B' || file[at + 5] == 'W') && file[at + 6] == 0 && file[at + 7] == 0;
            uint length = BinaryPrimitives.ReadUInt32LittleEndian(file.AsSpan(at + 8));
            if (vrOk && (length == uint.MaxValue || at + 12 + (long)length <= file.Length)) return (at + 12, length);
        }
        throw new InvalidDataException("no Explicit VR LE Pixel Data element found");
    }

    /// <summary>Transfer Syntax UID (0002,0010) from the File Meta group.</summary>
    public static string TransferSyntax(string path)
    {
        var file = File.ReadAllBytes(path);
        int at = file.AsSpan().IndexOf("\u0002\0\u0010\0UI"u8);
        if (at < 0) throw new InvalidDataException(path + " has no Transfer Syntax UID");
        int length = BinaryPrimitives.ReadUInt16LittleEndian(file.AsSpan(at + 6));
        return System.Text.Encoding.ASCII.GetString(file, at + 8, length).TrimEnd('\0', ' ');
    }

    /// <summary>Native (uncompressed) Pixel Data bytes.</summary>
    public static byte[] Native(string path)
    {
        var file = File.ReadAllBytes(path);
        var (start, length) = Locate(file);
        if (length == uint.MaxValue) throw new InvalidDataException(path + " has encapsulated Pixel Data");
        return file.AsSpan(start, (int)length).ToArray();
    }

    /// <summary>The compressed frames: one fragment per frame, all fragments when there is one frame, else grouped by the Basic Offset Table.</summary>
    public static List<byte[]> Frames(string path, int frameCount)
    {
        var file = File.ReadAllBytes(path);
        var (start, length) = Locate(file);
        if (length != uint.MaxValue) throw new InvalidDataException(path + " has native Pixel Data");
        var items = new List<(int Offset, byte[] Data)>();
        int at = start, firstFragment = -1;
        byte[]? offsetTable = null;
        while (at + 8 <= file.Length)
        {
            ushort group = BinaryPrimitives.ReadUInt16LittleEndian(file.AsSpan(at)), element = BinaryPrimitives.ReadUInt16LittleEndian(file.AsSpan(at + 2));
            int itemLength = (int)BinaryPrimitives.ReadUInt32LittleEndian(file.AsSpan(at + 4));
            if (group == 0xFFFE && element == 0xE0DD) break;
            if (group != 0xFFFE || element != 0xE000) throw new InvalidDataException($"unexpected tag in Pixel Data at {at}");
            var data = file.AsSpan(at + 8, itemLength).ToArray();
            if (offsetTable is null) { offsetTable = data; firstFragment = at + 8 + itemLength; }
            else items.Add((at - firstFragment, data));
            at += 8 + itemLength;
        }
        if (frameCount == 1) return [items.SelectMany(i => i.Data).ToArray()];
        if (items.Count == frameCount) return items.Select(i => i.Data).ToList();
        var starts = Enumerable.Range(0, frameCount).Select(f => (int)BinaryPrimitives.ReadUInt32LittleEndian(offsetTable!.AsSpan(4 * f))).ToList();
        return starts.Select((s, f) => items.Where(i => i.Offset >= s && (f + 1 == frameCount || i.Offset < starts[f + 1]))
            .SelectMany(i => i.Data).ToArray()).ToList();
    }
}
