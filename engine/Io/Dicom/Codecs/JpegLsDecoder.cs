using System.Buffers;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// JPEG-LS Lossless (1.2.840.10008.1.2.4.80, DICOM PS3.5 A.4.3), ITU-T T.87: SOF55 frame, LSE preset coding
/// parameters (C.2.4.1.1) and oversize dimensions, scans with NEAR = 0 that are not interleaved (ILV 0, one
/// scan per component), line-interleaved (ILV 1) or sample-interleaved (ILV 2), 2..16-bit samples. Near-lossless coding (NEAR &gt; 0,
/// transfer syntax 1.2.840.10008.1.2.4.81), mapping tables, point transforms and
/// restart intervals raise <see cref="Core.UnsupportedInputException"/>.
/// </summary>
public sealed class JpegLsDecoder : IFrameDecoder
{
    private const string Codec = "JPEG-LS";

    /// <summary>JPEG-LS Lossless Image Compression.</summary>
    public const string LosslessUid = "1.2.840.10008.1.2.4.80";

    /// <summary>
    /// JPEG-LS Lossy (Near-Lossless). Listed so that such frames get a precise error naming NEAR; a scan of this
    /// syntax coded with NEAR = 0 is lossless and decodes.
    /// </summary>
    public const string NearLosslessUid = "1.2.840.10008.1.2.4.81";

    /// <inheritdoc />
    public IReadOnlyList<string> TransferSyntaxUids { get; } = [LosslessUid, NearLosslessUid];

    /// <inheritdoc />
    public void Decode(ReadOnlySpan<byte> compressed, FrameInfo info, Span<byte> output)
    {
        var writer = new SampleWriter(output, info, Codec);
        var markers = new JpegMarkerReader(compressed, Codec);
        if (markers.ReadMarker() != JpegMarkerReader.Soi)
            throw CodecErrors.Malformed(Codec, "the frame does not start with the SOI marker 0xFFD8", 0);
        var frame = new JpegLsFrame(info);
        while (!(frame.AllDecoded && markers.AtEnd))
        {
            int at = markers.Position;
            if (frame.AllDecoded && compressed[at] != 0xFF) return; // padding after the last scan, EOI missing
            int marker = markers.ReadMarker();
            switch (marker)
            {
                case JpegMarkerReader.Eoi:
                    if (!frame.AllDecoded) throw CodecErrors.Malformed(Codec, "EOI reached before every component was decoded", at);
                    return;
                case JpegMarkerReader.SofLs:
                    frame.ReadFrameHeader(markers.ReadSegment(marker), at + 4);
                    break;
                case JpegMarkerReader.Lse:
                    frame.ReadPresets(markers.ReadSegment(marker), at + 4);
                    break;
                case JpegMarkerReader.Dri:
                    if (markers.U16(markers.ReadSegment(marker), 0, at + 4) != 0) throw CodecErrors.Unsupported(Codec, "a restart interval (DRI)");
                    break;
                case JpegMarkerReader.Sos:
                    var header = markers.ReadSegment(marker);
                    markers.Position = frame.DecodeScan(compressed, header, at + 4, markers.Position, writer);
                    break;
                case >= 0xC0 and <= 0xCF when marker is not (0xC4 or 0xC8 or 0xCC):
                    throw CodecErrors.Unsupported(Codec, $"a JPEG (T.81) frame marker 0xFF{marker:X2} in a JPEG-LS transfer syntax");
                case 0xE8:
                    RefuseColourTransform(markers.ReadSegment(marker));
                    break;
                case 0x01:
                    break;
                case >= 0xD0 and <= 0xD7:
                    throw CodecErrors.Malformed(Codec, $"restart marker RST{marker - 0xD0} outside a scan", at);
                default:
                    markers.ReadSegment(marker); // APPn, COM and other segments carry nothing this decoder needs
                    break;
            }
        }
    }

    /// <summary>
    /// An APP8 "mrfx" segment (an extension some JPEG-LS coders write, outside T.87) with a non-zero id announces
    /// a reversible colour transform of the samples; decoding without undoing it would give wrong colours.
    /// </summary>
    private static void RefuseColourTransform(ReadOnlySpan<byte> payload)
    {
        if (payload.Length >= 5 && payload[..4].SequenceEqual("mrfx"u8) && payload[4] != 0)
            throw CodecErrors.Unsupported(Codec, $"a colour transform (APP8 mrfx, type {payload[4]})");
    }

    /// <summary>Frame header, preset parameters and per-component progress of one frame.</summary>
    private sealed class JpegLsFrame(FrameInfo info)
    {
        private int _precision;
        private int[] _componentIds = [];
        private bool[] _decoded = [];
        private int _maxVal, _t1, _t2, _t3, _reset;
        private int _rows = -1, _columns = -1;

        public bool AllDecoded => _decoded.Length > 0 && Array.TrueForAll(_decoded, d => d);

        public void ReadFrameHeader(ReadOnlySpan<byte> p, int offset)
        {
            if (_decoded.Length > 0) throw CodecErrors.Malformed(Codec, "a second SOF55 frame header", offset);
            if (p.Length < 6) throw CodecErrors.Malformed(Codec, "the SOF55 segment is too short", offset);
            _precision = p[0];
            int rows = (p[1] << 8) | p[2], columns = (p[3] << 8) | p[4], count = p[5];
            if (_precision is < 2 or > 16) throw CodecErrors.Malformed(Codec, $"sample precision {_precision} (T.87 allows 2..16)", offset);
            if (_precision > info.BitsAllocated) throw CodecErrors.Mismatch(Codec, "sample precision", $"at most Bits Allocated {info.BitsAllocated}", _precision.ToString());
            if (count != info.SamplesPerPixel) throw CodecErrors.Mismatch(Codec, "number of components", info.SamplesPerPixel.ToString(), count.ToString());
            if (count > 4) throw CodecErrors.Unsupported(Codec, $"{count} components (at most 4)");
            if (p.Length < 6 + 3 * count) throw CodecErrors.Malformed(Codec, "the SOF55 segment is shorter than its component list", offset);
            if (rows != 0) _rows = rows;      // 0 here means: given by an LSE oversize segment (T.87 C.2.4.1.4)
            if (columns != 0) _columns = columns;
            _componentIds = new int[count];
            for (int c = 0; c < count; c++)
            {
                _componentIds[c] = p[6 + 3 * c];
                if (count > 1 && p[7 + 3 * c] != 0x11) throw CodecErrors.Unsupported(Codec, "component sub-sampling (sampling factors other than 1x1)");
            }
            _decoded = new bool[count];
        }

        public void ReadPresets(ReadOnlySpan<byte> p, int offset)
        {
            int id = p.Length > 0 ? p[0] : -1;
            if (id == 1)
            {
                if (p.Length < 11) throw CodecErrors.Malformed(Codec, "the LSE preset-parameters segment is too short", offset);
                _maxVal = (p[1] << 8) | p[2];
                _t1 = (p[3] << 8) | p[4];
                _t2 = (p[5] << 8) | p[6];
                _t3 = (p[7] << 8) | p[8];
                _reset = (p[9] << 8) | p[10];
            }
            else if (id == 4)
            {
                int width = p.Length > 1 ? p[1] : 0;
                if (width is < 2 or > 4 || p.Length < 2 + 2 * width) throw CodecErrors.Malformed(Codec, "the LSE oversize-dimensions segment is malformed", offset);
                long rows = 0, columns = 0;
                for (int i = 0; i < width; i++) { rows = (rows << 8) | p[2 + i]; columns = (columns << 8) | p[2 + width + i]; }
                _rows = (int)Math.Min(rows, int.MaxValue);
                _columns = (int)Math.Min(columns, int.MaxValue);
            }
            // ids 2 and 3 (mapping tables) are only refused when a scan selects a table
        }

        public int DecodeScan(ReadOnlySpan<byte> data, ReadOnlySpan<byte> p, int offset, int start, SampleWriter writer)
        {
            if (_decoded.Length == 0) throw CodecErrors.Malformed(Codec, "SOS before the SOF55 frame header", offset);
            CheckDimensions();
            int count = p.Length > 0 ? p[0] : 0;
            if (count < 1 || count > _componentIds.Length || p.Length < 4 + 2 * count)
                throw CodecErrors.Malformed(Codec, $"the scan header lists {count} components", offset);
            Span<int> planes = stackalloc int[count];
            for (int i = 0; i < count; i++)
            {
                planes[i] = Array.IndexOf(_componentIds, p[1 + 2 * i]);
                if (planes[i] < 0 || _decoded[planes[i]]) throw CodecErrors.Malformed(Codec, $"scan component {p[1 + 2 * i]} is unknown or repeated", offset);
                if (p[2 + 2 * i] != 0) throw CodecErrors.Unsupported(Codec, "a mapping table (palette) in the scan");
            }
            int near = p[1 + 2 * count], interleave = p[2 + 2 * count], pointTransform = p[3 + 2 * count] & 15;
            if (near != 0)
                throw CodecErrors.Unsupported(Codec, $"near-lossless coding (NEAR = {near}, transfer syntax 1.2.840.10008.1.2.4.81 JPEG-LS Lossy)");
            if (pointTransform != 0) throw CodecErrors.Unsupported(Codec, $"a point transform of {pointTransform} bits");
            if (interleave > 2 || (count > 1 && interleave == 0))
                throw CodecErrors.Malformed(Codec, $"interleave mode {interleave} with {count} components", offset);
            var parameters = JpegLsCodingParameters.Resolve(_precision, _maxVal, _t1, _t2, _t3, _reset);
            int next = interleave == 2 && count > 1
                ? DecodeSampleInterleaved(data, start, planes, parameters, writer)
                : DecodeLines(data, start, planes, parameters, writer);
            foreach (int plane in planes) _decoded[plane] = true;
            return next;
        }

        private void CheckDimensions()
        {
            if (_rows != info.Rows) throw CodecErrors.Mismatch(Codec, "number of lines", info.Rows.ToString(), _rows.ToString());
            if (_columns != info.Columns) throw CodecErrors.Mismatch(Codec, "samples per line", info.Columns.ToString(), _columns.ToString());
        }

        private int DecodeSampleInterleaved(ReadOnlySpan<byte> data, int start, ReadOnlySpan<int> planes, JpegLsCodingParameters parameters, SampleWriter writer)
        {
            int width = info.Columns, count = planes.Length, stride = (width + 2) * count;
            var lines = ArrayPool<int>.Shared.Rent(2 * stride);
            try
            {
                Array.Clear(lines, 0, 2 * stride);
                var decoder = new JpegLsScanDecoder(parameters, count);
                var reader = new JpegLsBitReader(data, start);
                for (int y = 0; y < info.Rows; y++)
                {
                    var prev = lines.AsSpan((y & 1) * stride, stride);
                    var cur = lines.AsSpan((1 - (y & 1)) * stride, stride);
                    for (int c = 0; c < count; c++)
                    {
                        prev[(width + 1) * count + c] = prev[width * count + c];
                        cur[c] = prev[count + c];
                    }
                    decoder.DecodeInterleavedLine(ref reader, prev, cur, width, count);
                    for (int c = 0; c < count; c++) writer.WriteRow(cur[(count + c)..], planes[c], y, 0, count);
                }
                return reader.FindNextMarker();
            }
            finally
            {
                ArrayPool<int>.Shared.Return(lines);
            }
        }

        private int DecodeLines(ReadOnlySpan<byte> data, int start, ReadOnlySpan<int> planes, JpegLsCodingParameters parameters, SampleWriter writer)
        {
            int width = info.Columns, stride = width + 2, count = planes.Length;
            var lines = ArrayPool<int>.Shared.Rent(2 * stride * count);
            try
            {
                Array.Clear(lines, 0, 2 * stride * count);
                var decoder = new JpegLsScanDecoder(parameters, count);
                var reader = new JpegLsBitReader(data, start);
                for (int y = 0; y < info.Rows; y++)
                {
                    for (int c = 0; c < count; c++)
                    {
                        int prevStart = (2 * c + (y & 1)) * stride, curStart = (2 * c + 1 - (y & 1)) * stride;
                        var prev = lines.AsSpan(prevStart, stride);
                        var cur = lines.AsSpan(curStart, stride);
                        prev[width + 1] = prev[width];
                        cur[0] = prev[1];
                        decoder.DecodeLine(ref reader, prev, cur, width, c);
                        writer.WriteRow(cur.Slice(1, width), planes[c], y, 0);
                    }
                }
                return reader.FindNextMarker();
            }
            finally
            {
                ArrayPool<int>.Shared.Return(lines);
            }
        }
    }
}
