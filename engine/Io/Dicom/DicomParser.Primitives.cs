using System.Buffers.Binary;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

internal sealed partial class DicomParser
{
    /// <summary>Ensures <paramref name="count"/> bytes remain, else asks for more data or reports the truncation.</summary>
    internal void Need(long count, string what)
    {
        if (_pos + count <= _buf.Length) return;
        if (isPrefix) throw new DicomNeedMoreDataException();
        throw Format($"the data ends inside {what} at byte {_pos}: {count} bytes needed, {_buf.Length - _pos} remain (truncated file?)");
    }

    internal DicomTag ReadTag(bool bigEndian)
    {
        var g = ReadUInt16(bigEndian);
        var e = ReadUInt16(bigEndian);
        return new DicomTag(g, e);
    }

    internal ushort ReadUInt16(bool bigEndian)
    {
        var s = Span.Slice(_pos, 2);
        _pos += 2;
        return bigEndian ? BinaryPrimitives.ReadUInt16BigEndian(s) : BinaryPrimitives.ReadUInt16LittleEndian(s);
    }

    internal uint ReadUInt32(bool bigEndian)
    {
        var s = Span.Slice(_pos, 4);
        _pos += 4;
        return bigEndian ? BinaryPrimitives.ReadUInt32BigEndian(s) : BinaryPrimitives.ReadUInt32LittleEndian(s);
    }

    /// <summary>Reads VR and length after the tag (PS3.5 7.1.1-7.1.3). 8 header bytes are known to be present.</summary>
    private (DicomVR Vr, uint Length) ReadHeaderRest(DicomTag tag, DicomEncoding enc)
    {
        if (enc.Implicit) return (ImplicitVR(tag), ReadUInt32(false));
        if (DicomVRInfo.TryParse(Span[_pos], Span[_pos + 1], out var vr))
        {
            _pos += 2;
            if (!vr.HasLongLength()) return (vr, ReadUInt16(enc.BigEndian));
            _pos += 2; // reserved
            Need(4, $"the header of {tag}");
            return (vr, ReadUInt32(enc.BigEndian));
        }
        // Some writers switch to Implicit VR for single elements; dcmtk reads those the same way.
        log.Lenient($"element {tag} at byte {_pos - 4} has no valid explicit VR; read as Implicit VR");
        return (ImplicitVR(tag), ReadUInt32(enc.BigEndian));
    }

    /// <summary>The VR of an Implicit VR element: data dictionary (PS3.6), group length UL, private creator LO, else UN.</summary>
    internal static DicomVR ImplicitVR(DicomTag tag)
    {
        if (tag.Element == 0) return DicomVR.UL;
        if (tag.IsPrivateCreator) return DicomVR.LO;
        if (tag.IsPrivate) return DicomVR.UN;
        var e = DicomDictionary.Lookup(tag);
        return e is null || e.VR == DicomVR.None ? DicomVR.UN : e.VR;
    }

    private void CheckFits(DicomTag tag, DicomVR vr, uint length, int limit)
    {
        if (length <= (uint)(limit - _pos)) return;
        if (isPrefix && limit == _buf.Length) throw new DicomNeedMoreDataException();
        TooLong($"element {tag} ({vr.Code()})", length, limit);
    }

    private void TooLong(string what, uint length, int limit)
    {
        if (isPrefix && limit == _buf.Length) throw new DicomNeedMoreDataException();
        throw Format($"{what} at byte {_pos} declares length {length}, but only {Math.Max(0, limit - _pos)} bytes remain in its container (truncated or corrupt file)");
    }

    private InputFormatException Format(string message) =>
        new(message, log.Source, "the file is truncated or corrupt; copy it again from the source or re-export it");
}

/// <summary>Where the top-level Pixel Data value lies, recorded by a header-only read.</summary>
/// <param name="Offset">Byte offset of the value in the file (or in the inflated data set for Deflated files).</param>
/// <param name="Length">Value length in bytes; -1 for undefined length (encapsulated).</param>
/// <param name="VR">OB or OW (Implicit VR: OW).</param>
/// <param name="Encapsulated">True for encapsulated (compressed) Pixel Data, PS3.5 A.4.</param>
public sealed record DicomPixelDataLocation(long Offset, long Length, DicomVR VR, bool Encapsulated);
