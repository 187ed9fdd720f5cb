using System.Buffers.Binary;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// RLE Lossless (1.2.840.10008.1.2.5), DICOM PS3.5 Annex G: a 64-byte header of 16 little-endian uint32
/// (segment count, then up to 15 segment offsets), then one PackBits segment per byte plane. Segments run
/// sample by sample and, within a sample, from the most significant byte to the least (G.2); colour is
/// therefore stored by plane and is written back in the layout <see cref="FrameInfo.PlanarConfiguration"/> asks for.
/// </summary>
public sealed class RleLosslessDecoder : IFrameDecoder
{
    private const string Codec = "RLE Lossless";
    private const int HeaderBytes = 64;

    /// <summary>RLE Lossless transfer syntax UID (PS3.5 Annex G).</summary>
    public const string TransferSyntaxUid = "1.2.840.10008.1.2.5";

    /// <inheritdoc />
    public IReadOnlyList<string> TransferSyntaxUids { get; } = [TransferSyntaxUid];

    /// <inheritdoc />
    public void Decode(ReadOnlySpan<byte> compressed, FrameInfo info, Span<byte> output)
    {
        if (info.BitsAllocated is not (8 or 16 or 32))
            throw CodecErrors.Unsupported(Codec, $"Bits Allocated {info.BitsAllocated} (PS3.5 G.2 byte segments need 8, 16 or 32)");
        if (output.Length != info.DecodedLength)
            throw new ArgumentException($"output is {output.Length} bytes; the frame needs {info.DecodedLength}", nameof(output));
        if (compressed.Length < HeaderBytes)
            throw CodecErrors.Malformed(Codec, $"the frame is {compressed.Length} bytes, shorter than the 64-byte RLE header", 0);

        int bytesPerSample = info.BitsAllocated / 8;
        int expectedSegments = info.SamplesPerPixel * bytesPerSample;
        if (expectedSegments > 15)
            throw CodecErrors.Unsupported(Codec, $"{expectedSegments} byte segments (the RLE header holds at most 15)");
        uint segmentCount = BinaryPrimitives.ReadUInt32LittleEndian(compressed);
        if (segmentCount != expectedSegments)
            throw CodecErrors.Mismatch(Codec, "number of segments", $"{expectedSegments} (Samples per Pixel x Bits Allocated / 8)", segmentCount.ToString());

        int pixels = info.Rows * info.Columns;
        bool planar = info.PlanarConfiguration == 1;
        for (int segment = 0; segment < expectedSegments; segment++)
        {
            var (start, end) = SegmentBounds(compressed, segment, expectedSegments);
            int sample = segment / bytesPerSample;
            int byteInSample = bytesPerSample - 1 - segment % bytesPerSample; // most significant first
            int first = planar ? sample * pixels * bytesPerSample + byteInSample : sample * bytesPerSample + byteInSample;
            int stride = planar ? bytesPerSample : bytesPerSample * info.SamplesPerPixel;
            UnpackSegment(compressed[start..end], start, output, first, stride, pixels);
        }
    }

    private static (int Start, int End) SegmentBounds(ReadOnlySpan<byte> data, int segment, int count)
    {
        uint start = BinaryPrimitives.ReadUInt32LittleEndian(data[(4 + 4 * segment)..]);
        uint end = segment + 1 < count ? BinaryPrimitives.ReadUInt32LittleEndian(data[(8 + 4 * segment)..]) : (uint)data.Length;
        if (start < HeaderBytes || start > end || end > data.Length)
            throw CodecErrors.Malformed(Codec,
                $"segment {segment + 1} spans bytes {start}..{end}, outside the {data.Length}-byte frame or before the header ends", 4 + 4 * segment);
        return ((int)start, (int)end);
    }

    /// <summary>
    /// PackBits (PS3.5 G.3.1): header n in 0..127 copies the next n+1 bytes, -1..-127 repeats the next byte
    /// 1-n times, -128 is a no-op. Output is scattered to every <paramref name="stride"/>-th byte.
    /// Bytes beyond the frame's sample count are ignored (padding); a short segment is an error.
    /// </summary>
    internal static void UnpackSegment(ReadOnlySpan<byte> segment, int segmentOffset, Span<byte> output, int first, int stride, int count)
    {
        int produced = 0, o = first, i = 0;
        while (produced < count && i < segment.Length)
        {
            int n = (sbyte)segment[i++];
            if (n >= 0)
            {
                int run = Math.Min(n + 1, count - produced);
                if (i + n + 1 > segment.Length)
                    throw CodecErrors.Malformed(Codec, $"a literal run of {n + 1} bytes passes the end of its segment", segmentOffset + i - 1);
                for (int k = 0; k < run; k++, o += stride) output[o] = segment[i + k];
                i += n + 1;
                produced += run;
            }
            else if (n != -128)
            {
                if (i >= segment.Length)
                    throw CodecErrors.Malformed(Codec, "a replicate run has no byte to repeat", segmentOffset + i - 1);
                byte value = segment[i++];
                int run = Math.Min(1 - n, count - produced);
                for (int k = 0; k < run; k++, o += stride) output[o] = value;
                produced += run;
            }
        }
        if (produced < count)
            throw CodecErrors.Malformed(Codec, $"a segment decodes to {produced} bytes but the frame has {count} pixels", segmentOffset + segment.Length);
    }
}
