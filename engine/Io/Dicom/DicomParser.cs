using System.Buffers.Binary;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>How a data set is encoded (PS3.5 section 7.1 and annex A).</summary>
internal readonly record struct DicomEncoding(bool Implicit, bool BigEndian)
{
    public static readonly DicomEncoding ExplicitLittle = new(false, false);
    public static readonly DicomEncoding ImplicitLittle = new(true, false);
    public static readonly DicomEncoding ExplicitBig = new(false, true);

    public override string ToString() =>
        (Implicit ? "Implicit VR " : "Explicit VR ") + (BigEndian ? "Big Endian" : "Little Endian");
}

/// <summary>Thrown when a buffer holding only the start of a file ends too early; the caller reads more.</summary>
internal sealed class DicomNeedMoreDataException : Exception;

/// <summary>
/// Parses data elements from memory into <see cref="DicomDataset"/>s: element headers of PS3.5 7.1,
/// sequences and items of defined and undefined length (7.5), encapsulated Pixel Data (A.4), and UN of
/// undefined length as an Implicit VR Little Endian sequence (6.2.2). Every length is checked against
/// the bytes that remain before anything is sliced or allocated.
/// </summary>
internal sealed partial class DicomParser(ReadOnlyMemory<byte> buffer, DicomReadLog log, bool isPrefix)
{
    internal const uint UndefinedLength = 0xFFFFFFFF;
    private static readonly DicomTag PixelDataTag = new(0x7FE0, 0x0010);

    private readonly ReadOnlyMemory<byte> _buf = buffer;
    private int _pos;

    /// <summary>Stop at the top-level Pixel Data element without reading its value.</summary>
    public bool StopAtPixelData { get; init; }

    /// <summary>Where the top-level Pixel Data value is (offset within this buffer), once seen.</summary>
    public DicomPixelDataLocation? PixelData { get; private set; }

    public int Position { get => _pos; set => _pos = value; }

    public int Length => _buf.Length;

    private ReadOnlySpan<byte> Span => _buf.Span;

    /// <summary>Parses a whole data set from the current position to the end of the buffer.</summary>
    public DicomDataset ParseDataset(DicomEncoding enc)
    {
        var ds = new DicomDataset(enc.BigEndian, null, log);
        ParseElements(ds, _buf.Length, false, enc, 0, _buf.Length);
        return ds;
    }

    /// <summary>Parses elements into <paramref name="ds"/> until <paramref name="end"/> or an Item Delimitation.</summary>
    private void ParseElements(DicomDataset ds, int end, bool untilDelimiter, DicomEncoding enc, int depth, int limit)
    {
        while (true)
        {
            if (!untilDelimiter && _pos >= end) return;
            if (untilDelimiter && _pos >= limit)
            {
                if (isPrefix && limit == _buf.Length) throw new DicomNeedMoreDataException();
                log.Lenient($"an item of undefined length lacks its Item Delimitation Item (data end at byte {_pos})");
                return;
            }
            if (depth == 0 && end - _pos < 8 && !isPrefix && !Span[_pos..end].ContainsAnyExcept((byte)0))
            {
                log.Lenient($"{end - _pos} trailing zero byte(s) after the last element ignored");
                _pos = end;
                return;
            }
            var start = _pos;
            Need(8, "an element header");
            var tag = ReadTag(enc.BigEndian);
            if (tag.Group == 0xFFFE)
            {
                var len = ReadUInt32(enc.BigEndian);
                if (tag == DicomTag.ItemDelimitation && untilDelimiter) return;
                if (tag == DicomTag.SequenceDelimitation && untilDelimiter)
                {
                    log.Lenient($"an item was ended by a Sequence Delimitation Item at byte {start}");
                    _pos = start;
                    return;
                }
                if (tag == DicomTag.Item)
                    throw Format($"an Item tag {tag} (length {len}) appears outside a sequence at byte {start}");
                log.Lenient($"stray delimiter {tag} at byte {start} ignored");
                continue;
            }
            var (vr, length) = ReadHeaderRest(tag, enc);
            if (enc.Implicit && vr == DicomVR.US && IsSignedPixelData(ds) && DicomDictionary.Lookup(tag) is { UsOrSs: true })
                vr = DicomVR.SS;
            if (depth == 0 && StopAtPixelData && tag == PixelDataTag)
            {
                PixelData = new DicomPixelDataLocation(_pos, length == UndefinedLength ? -1 : length, vr,
                    length == UndefinedLength);
                _pos = _buf.Length;
                return;
            }
            ds.Add(ReadValue(ds, tag, vr, length, enc, depth, untilDelimiter ? limit : Math.Min(end, limit)));
        }
    }

    private DicomElement ReadValue(DicomDataset ds, DicomTag tag, DicomVR vr, uint length, DicomEncoding enc, int depth, int limit)
    {
        var valueStart = _pos;
        if (length == UndefinedLength)
        {
            if (tag == PixelDataTag)
            {
                if (depth == 0) PixelData = new DicomPixelDataLocation(_pos, -1, vr, true);
                return new DicomElement(tag, vr, ReadOnlyMemory<byte>.Empty, valueStart, true, fragments: ParseFragments(tag, limit));
            }
            if (vr != DicomVR.SQ && vr != DicomVR.UN && !enc.Implicit)
                log.Lenient($"element {tag} with VR {vr.Code()} has undefined length; read as a sequence");
            // PS3.5 6.2.2: UN of undefined length holds an Implicit VR Little Endian sequence.
            var itemEnc = vr == DicomVR.UN ? DicomEncoding.ImplicitLittle : enc;
            var items = ParseItems(ds, tag, length, itemEnc, depth, limit);
            // Read as a sequence, it is one: report SQ as dcmtk does.
            return new DicomElement(tag, DicomVR.SQ, ReadOnlyMemory<byte>.Empty, valueStart, true, items);
        }
        CheckFits(tag, vr, length, limit);
        if (vr == DicomVR.SQ)
        {
            var items = ParseItems(ds, tag, length, enc, depth, limit);
            _pos = valueStart + (int)length;
            return new DicomElement(tag, vr, ReadOnlyMemory<byte>.Empty, valueStart, false, items);
        }
        if ((length & 1) == 1) log.Lenient($"element {tag} has odd length {length}");
        if (tag == PixelDataTag && depth == 0) PixelData = new DicomPixelDataLocation(_pos, length, vr, false);
        var value = _buf.Slice(_pos, (int)length);
        _pos += (int)length;
        return new DicomElement(tag, vr, value, valueStart, false);
    }

    private List<DicomDataset> ParseItems(DicomDataset parent, DicomTag seqTag, uint length, DicomEncoding enc, int depth, int limit)
    {
        if (depth + 1 > log.Options.MaxSequenceDepth)
            throw new InputLimitException($"sequences nest deeper than {log.Options.MaxSequenceDepth} levels (at {seqTag}, byte {_pos})",
                log.Source, "the file is corrupt or hostile; Serimetry refuses such nesting");
        var end = length == UndefinedLength ? -1 : _pos + (int)length;
        var items = new List<DicomDataset>();
        while (true)
        {
            if (end >= 0 && _pos >= end) break;
            if (end < 0 && _pos >= limit)
            {
                if (isPrefix && limit == _buf.Length) throw new DicomNeedMoreDataException();
                log.Lenient($"sequence {seqTag} lacks its Sequence Delimitation Item before the data ends");
                break;
            }
            var at = _pos;
            Need(8, $"an item header in sequence {seqTag}");
            var tag = ReadTag(enc.BigEndian);
            var itemLength = ReadUInt32(enc.BigEndian);
            if (tag == DicomTag.SequenceDelimitation)
            {
                if (end >= 0) log.Lenient($"sequence {seqTag} of defined length contains a Sequence Delimitation Item");
                break;
            }
            if (tag != DicomTag.Item)
                throw Format($"sequence {seqTag} holds {tag} at byte {at} where an Item (FFFE,E000) was expected");
            var item = new DicomDataset(enc.BigEndian, parent, log);
            var itemLimit = end >= 0 ? Math.Min(end, limit) : limit;
            if (itemLength == UndefinedLength)
                ParseElements(item, itemLimit, true, enc, depth + 1, itemLimit);
            else
            {
                if (itemLength > itemLimit - _pos) TooLong($"item of sequence {seqTag}", itemLength, itemLimit);
                var itemEnd = _pos + (int)itemLength;
                ParseElements(item, itemEnd, false, enc, depth + 1, itemEnd);
                _pos = itemEnd;
            }
            items.Add(item);
        }
        return items;
    }

    /// <summary>"US or SS" attributes are SS when Pixel Representation (0028,0103) of the data set (or an enclosing one) is 1.</summary>
    private static bool IsSignedPixelData(DicomDataset ds)
    {
        for (var d = ds; d is not null; d = d.Parent)
            if (d.Find(new DicomTag(0x0028, 0x0103)) is { } pr)
                return pr.Value.Length >= 2 && BinaryPrimitives.ReadUInt16LittleEndian(pr.Value.Span) == 1;
        return false;
    }

    /// <summary>Reads the Basic Offset Table and fragments of encapsulated Pixel Data (PS3.5 A.4).</summary>
    internal DicomFragments ParseFragments(DicomTag tag, int limit)
    {
        var first = _pos;
        var bot = new List<uint>();
        var fragments = new List<ReadOnlyMemory<byte>>();
        var offsets = new List<long>();
        var sawTable = false;
        while (true)
        {
            if (_pos >= limit)
            {
                if (isPrefix && limit == _buf.Length) throw new DicomNeedMoreDataException();
                log.Lenient($"encapsulated {tag} lacks its Sequence Delimitation Item");
                break;
            }
            var at = _pos;
            Need(8, "a fragment item header");
            var itemTag = ReadTag(false);
            var len = ReadUInt32(false);
            if (itemTag == DicomTag.SequenceDelimitation) break;
            if (itemTag != DicomTag.Item)
                throw Format($"encapsulated {tag} holds {itemTag} at byte {at} where a fragment Item was expected");
            if (len == UndefinedLength || len > limit - _pos) TooLong("a fragment of encapsulated Pixel Data", len, limit);
            var value = _buf.Slice(_pos, (int)len);
            _pos += (int)len;
            if (!sawTable)
            {
                sawTable = true;
                for (var i = 0; i + 4 <= value.Length; i += 4) bot.Add(BinaryPrimitives.ReadUInt32LittleEndian(value.Span[i..]));
                first = _pos;
                continue;
            }
            fragments.Add(value);
            offsets.Add(at - first);
        }
        return new DicomFragments(bot, fragments, offsets);
    }
}

internal sealed partial class DicomParser
{
    /// <summary>
    /// Reads File Meta elements (group 0002, always Explicit VR Little Endian, PS3.10 7.1) until the
    /// first element of another group; the group length is not trusted (it is optional in practice).
    /// </summary>
    public DicomDataset ParseFileMeta()
    {
        var ds = new DicomDataset(false, null, log);
        while (true)
        {
            if (_pos + 8 > _buf.Length)
            {
                if (isPrefix) throw new DicomNeedMoreDataException();
                break;
            }
            if (BinaryPrimitives.ReadUInt16LittleEndian(Span[_pos..]) != 0x0002) break;
            var tag = ReadTag(false);
            var (vr, length) = ReadHeaderRest(tag, DicomEncoding.ExplicitLittle);
            if (length == UndefinedLength)
                throw Format($"File Meta element {tag} has undefined length");
            ds.Add(ReadValue(ds, tag, vr, length, DicomEncoding.ExplicitLittle, 0, _buf.Length));
        }
        return ds;
    }
}
