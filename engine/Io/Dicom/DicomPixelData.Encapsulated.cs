using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;

namespace Serimetry.Engine.Io.Dicom;

public sealed partial class DicomPixelData
{
    private byte[] DecodeFrame(int frame)
    {
        var compressed = FrameData(frame);
        var len = (int)Info.FrameBytes;
        if (_decoder is null)
        {
            // Encapsulated Uncompressed Explicit VR Little Endian (PS3.5 A.4.11): fragments are raw frames.
            if (compressed.Length < len)
                throw new InputFormatException($"frame {frame + 1} holds {compressed.Length} bytes; {len} needed", _log.Source,
                    "the file is truncated; re-export it");
            return compressed[..len];
        }
        var info = new FrameInfo(Info.Rows, Info.Columns, Info.SamplesPerPixel, Info.BitsAllocated, Info.BitsStored,
            Info.PixelRepresentation, Info.PlanarConfiguration);
        var output = new byte[Math.Max(info.DecodedLength, len)];
        _decoder.Decode(compressed, info, output.AsSpan(0, info.DecodedLength));
        return output.Length == len ? output : output[..len];
    }

    /// <summary>The concatenated fragments of one frame.</summary>
    private byte[] FrameData(int frame)
    {
        var (first, count) = FrameFragmentRange(frame);
        var f = _fragments!.Fragments;
        if (count == 1) return f[first].ToArray();
        long total = 0;
        for (var i = first; i < first + count; i++) total += f[i].Length;
        var result = new byte[checked((int)total)];
        var at = 0;
        for (var i = first; i < first + count; i++)
        {
            f[i].Span.CopyTo(result.AsSpan(at));
            at += f[i].Length;
        }
        return result;
    }

    /// <summary>
    /// Which fragments make up a frame (PS3.5 A.4): by the Extended or Basic Offset Table when present,
    /// else one fragment per frame, else all fragments for a single frame, else by JPEG EOI markers.
    /// </summary>
    private (int First, int Count) FrameFragmentRange(int frame)
    {
        var fr = _fragments!;
        var n = fr.Fragments.Count;
        if (n == 0)
            throw new InputFormatException("encapsulated Pixel Data has no fragments", _log.Source, "the file is corrupt; re-export it");
        var table = OffsetTable();
        if (table is not null) return RangeByOffsets(table, frame);
        if (n == Info.Frames) return (frame, 1);
        if (Info.Frames == 1) return (0, n);
        return RangeByEndMarkers(frame);
    }

    private long[]? OffsetTable()
    {
        if (_dataset.Find(DicomTags.ExtendedOffsetTable) is { } eot && eot.Value.Length >= 8)
        {
            var v = DicomValueConverter.Integers(eot, _dataset);
            if (v.Length == Info.Frames) return v;
            _log.Lenient($"Extended Offset Table has {v.Length} entries for {Info.Frames} frames; ignored");
        }
        var bot = _fragments!.BasicOffsetTable;
        if (bot.Count == 0) return null;
        if (bot.Count != Info.Frames)
        {
            _log.Lenient($"Basic Offset Table has {bot.Count} entries for {Info.Frames} frames; ignored");
            return null;
        }
        var t = new long[bot.Count];
        for (var i = 0; i < t.Length; i++) t[i] = bot[i];
        return t;
    }

    private (int, int) RangeByOffsets(long[] table, int frame)
    {
        var offsets = _fragments!.FragmentOffsets;
        var start = table[frame];
        var end = frame + 1 < table.Length ? table[frame + 1] : long.MaxValue;
        var first = -1;
        var count = 0;
        for (var i = 0; i < offsets.Count; i++)
        {
            if (offsets[i] < start || offsets[i] >= end) continue;
            if (first < 0) first = i;
            count++;
        }
        if (first < 0 || offsets[first] != start)
            throw new InputFormatException($"the offset table points frame {frame + 1} to byte {start}, where no fragment starts",
                _log.Source, "the file is corrupt; re-export it");
        return (first, count);
    }

    /// <summary>Groups fragments into frames at JPEG End Of Image markers (FFD9, ITU T.81 B.1.1.3).</summary>
    private (int, int) RangeByEndMarkers(int frame)
    {
        var f = _fragments!.Fragments;
        var current = 0;
        var first = 0;
        for (var i = 0; i < f.Count; i++)
        {
            if (!EndsWithEoi(f[i].Span)) continue;
            if (current == frame) return (first, i - first + 1);
            current++;
            first = i + 1;
        }
        throw new InputFormatException(
            $"cannot find the fragments of frame {frame + 1}: {f.Count} fragments, no offset table, {Info.Frames} frames",
            _log.Source, "the file is ambiguous or corrupt; convert it with `gdcmconv --raw in.dcm out.dcm`");
    }

    private static bool EndsWithEoi(ReadOnlySpan<byte> s)
    {
        var end = s.Length;
        if (end > 0 && s[end - 1] == 0) end--; // even-length padding
        return end >= 2 && s[end - 2] == 0xFF && s[end - 1] == 0xD9;
    }
}
