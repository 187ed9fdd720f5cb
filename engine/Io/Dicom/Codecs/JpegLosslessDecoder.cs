using System.Buffers;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// JPEG Lossless, Non-Hierarchical (Process 14), ITU-T T.81 Annex H with Huffman coding: the frame header
/// SOF3, DHT, DRI and one or more SOS scans (interleaved or not), predictors 1-7, point transform,
/// restart intervals, 2..16-bit precision. DICOM PS3.5 A.4.1 transfer syntaxes 1.2.840.10008.1.2.4.57
/// (any predictor) and 1.2.840.10008.1.2.4.70 (Selection Value 1).
/// </summary>
public sealed class JpegLosslessDecoder : IFrameDecoder
{
    private const string Codec = "JPEG Lossless";

    /// <summary>JPEG Lossless, Non-Hierarchical (Process 14).</summary>
    public const string Process14Uid = "1.2.840.10008.1.2.4.57";

    /// <summary>JPEG Lossless, Non-Hierarchical, First-Order Prediction (Process 14, Selection Value 1).</summary>
    public const string Process14Sv1Uid = "1.2.840.10008.1.2.4.70";

    /// <inheritdoc />
    public IReadOnlyList<string> TransferSyntaxUids { get; } = [Process14Uid, Process14Sv1Uid];

    /// <inheritdoc />
    public void Decode(ReadOnlySpan<byte> compressed, FrameInfo info, Span<byte> output)
    {
        var writer = new SampleWriter(output, info, Codec);
        var markers = new JpegMarkerReader(compressed, Codec);
        if (markers.ReadMarker() != JpegMarkerReader.Soi)
            throw CodecErrors.Malformed(Codec, "the frame does not start with the SOI marker 0xFFD8", 0);
        var state = new DecodeState(info);
        try
        {
            ReadMarkers(ref markers, compressed, state);
            state.WriteTo(writer);
        }
        finally
        {
            state.Release();
        }
    }

    private static void ReadMarkers(ref JpegMarkerReader markers, ReadOnlySpan<byte> data, DecodeState state)
    {
        while (!(state.AllDecoded && markers.AtEnd))
        {
            int at = markers.Position;
            if (state.AllDecoded && data[at] != 0xFF) return; // padding after the last scan, EOI missing
            int marker = markers.ReadMarker();
            switch (marker)
            {
                case JpegMarkerReader.Eoi:
                    if (!state.AllDecoded) throw CodecErrors.Malformed(Codec, "EOI reached before every component was decoded", at);
                    return;
                case JpegMarkerReader.Sof3:
                    state.ReadFrame(markers.ReadSegment(marker), at + 4);
                    break;
                case JpegMarkerReader.Dht:
                    state.ReadTables(markers.ReadSegment(marker), at + 4);
                    break;
                case JpegMarkerReader.Dri:
                    var dri = markers.ReadSegment(marker);
                    state.RestartInterval = markers.U16(dri, 0, at + 4);
                    break;
                case JpegMarkerReader.Sos:
                    var sos = markers.ReadSegment(marker);
                    markers.Position = state.ReadScan(data, sos, at + 4, markers.Position);
                    break;
                case >= 0xC0 and <= 0xCF when marker is not (0xC4 or 0xC8 or 0xCC):
                    throw CodecErrors.Unsupported(Codec, $"{SofName(marker)} (marker 0xFF{marker:X2}); this decoder reads lossless Process 14 (SOF3) only");
                case JpegMarkerReader.SofLs:
                    throw CodecErrors.Unsupported(Codec, "a JPEG-LS (T.87) frame in a JPEG lossless transfer syntax");
                case >= 0xD0 and <= 0xD7:
                    throw CodecErrors.Malformed(Codec, $"restart marker RST{marker - 0xD0} outside a scan", at);
                case 0x01:
                    break; // TEM: no length
                default:
                    markers.ReadSegment(marker); // APPn, COM, DQT, DAC, DNL and others carry nothing this decoder needs
                    break;
            }
        }
    }

    private static string SofName(int marker) => marker switch
    {
        0xC0 => "baseline lossy JPEG",
        0xC1 or 0xC2 => "lossy JPEG (extended or progressive DCT)",
        0xC5 or 0xC6 or 0xC7 => "hierarchical JPEG",
        >= 0xC9 => "arithmetic-coded JPEG",
        _ => "this JPEG process",
    };

    /// <summary>Frame parameters, Huffman tables and the decoded sample planes of one frame.</summary>
    private sealed class DecodeState(FrameInfo info)
    {
        private readonly JpegHuffmanTable?[] _tables = new JpegHuffmanTable?[4];
        private int[] _componentIds = [];
        private bool[] _decoded = [];
        private int[]? _planes;
        private int _precision;
        private int _pointTransform = -1;

        public int RestartInterval { get; set; }

        public bool AllDecoded => _decoded.Length > 0 && Array.TrueForAll(_decoded, d => d);

        public void ReadFrame(ReadOnlySpan<byte> p, int offset)
        {
            if (_planes is not null) throw CodecErrors.Malformed(Codec, "a second SOF3 frame header", offset);
            if (p.Length < 6) throw CodecErrors.Malformed(Codec, "the SOF3 segment is too short", offset);
            _precision = p[0];
            int rows = (p[1] << 8) | p[2], columns = (p[3] << 8) | p[4], count = p[5];
            if (_precision is < 2 or > 16) throw CodecErrors.Malformed(Codec, $"sample precision {_precision} (T.81 allows 2..16)", offset);
            if (rows == 0) throw CodecErrors.Unsupported(Codec, "a frame height given only by a DNL marker");
            if (rows != info.Rows) throw CodecErrors.Mismatch(Codec, "number of lines", info.Rows.ToString(), rows.ToString());
            if (columns != info.Columns) throw CodecErrors.Mismatch(Codec, "samples per line", info.Columns.ToString(), columns.ToString());
            if (count != info.SamplesPerPixel) throw CodecErrors.Mismatch(Codec, "number of components", info.SamplesPerPixel.ToString(), count.ToString());
            if (_precision > info.BitsAllocated) throw CodecErrors.Mismatch(Codec, "sample precision", $"at most Bits Allocated {info.BitsAllocated}", _precision.ToString());
            if (p.Length < 6 + 3 * count) throw CodecErrors.Malformed(Codec, "the SOF3 segment is shorter than its component list", offset);
            _componentIds = new int[count];
            _decoded = new bool[count];
            for (int c = 0; c < count; c++)
            {
                _componentIds[c] = p[6 + 3 * c];
                int sampling = p[7 + 3 * c];
                if (count > 1 && sampling != 0x11)
                    throw CodecErrors.Unsupported(Codec, $"component sampling factors {sampling >> 4}x{sampling & 15} (only 1x1 with several components)");
            }
            _planes = ArrayPool<int>.Shared.Rent(checked(rows * columns * count));
        }

        public void ReadTables(ReadOnlySpan<byte> p, int offset)
        {
            for (int at = 0; at < p.Length;)
            {
                var table = JpegHuffmanTable.Parse(p, at, Codec, offset, out int tableClass, out int id, out int used);
                if (tableClass == 0) _tables[id] = table; // lossless uses the DC-class tables (T.81 H.1.2.2)
                at += used;
            }
        }

        public int ReadScan(ReadOnlySpan<byte> data, ReadOnlySpan<byte> p, int offset, int entropyStart)
        {
            if (_planes is null) throw CodecErrors.Malformed(Codec, "SOS before the SOF3 frame header", offset);
            int count = p.Length > 0 ? p[0] : 0;
            if (count < 1 || count > _componentIds.Length || p.Length < 4 + 2 * count)
                throw CodecErrors.Malformed(Codec, $"the scan header lists {count} components", offset);
            Span<JpegScanComponent> components = new JpegScanComponent[count];
            for (int i = 0; i < count; i++)
            {
                int plane = Array.IndexOf(_componentIds, p[1 + 2 * i]);
                int tableId = p[2 + 2 * i] >> 4;
                if (plane < 0 || _decoded[plane]) throw CodecErrors.Malformed(Codec, $"scan component {p[1 + 2 * i]} is unknown or repeated", offset);
                var table = tableId < 4 ? _tables[tableId] : null;
                if (table is null) throw CodecErrors.Malformed(Codec, $"scan uses Huffman table {tableId}, which no DHT defined", offset);
                components[i] = new JpegScanComponent(plane, table);
            }
            int predictor = p[1 + 2 * count], pointTransform = p[3 + 2 * count] & 15;
            if (predictor is < 1 or > 7) throw CodecErrors.Malformed(Codec, $"predictor selection value {predictor} (T.81 Table H.1 has 1..7)", offset);
            if (pointTransform >= _precision || (_pointTransform >= 0 && pointTransform != _pointTransform))
                throw CodecErrors.Malformed(Codec, $"point transform {pointTransform} for precision {_precision}", offset);
            _pointTransform = pointTransform;
            int next = JpegLosslessScan.Decode(data, entropyStart, components, _planes, info.Columns, info.Rows, _precision,
                predictor, pointTransform, RestartInterval, Codec);
            foreach (var c in components) _decoded[c.Plane] = true;
            return next;
        }

        public void WriteTo(SampleWriter writer)
        {
            if (_planes is null || !AllDecoded) throw CodecErrors.Malformed(Codec, "the codestream ends before every component was decoded", 0);
            int width = info.Columns, planeSize = width * info.Rows;
            for (int c = 0; c < _componentIds.Length; c++)
                for (int y = 0; y < info.Rows; y++)
                    writer.WriteRow(_planes.AsSpan(c * planeSize + y * width, width), c, y, _pointTransform);
        }

        public void Release()
        {
            if (_planes is not null) ArrayPool<int>.Shared.Return(_planes);
            _planes = null;
        }
    }
}
