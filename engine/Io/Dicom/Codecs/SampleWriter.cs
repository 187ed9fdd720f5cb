using System.Buffers.Binary;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// Writes decoded sample rows into the native little-endian frame layout of PS3.5 section 8.1: samples of
/// Bits Allocated width, colour either interleaved (Planar Configuration 0) or by plane (1), PS3.3 C.7.6.3.1.3.
/// </summary>
internal readonly ref struct SampleWriter
{
    private readonly Span<byte> _output;
    private readonly int _columns;
    private readonly int _rows;
    private readonly int _samples;
    private readonly int _bytesPerSample;
    private readonly bool _planar;

    public SampleWriter(Span<byte> output, FrameInfo info, string codec)
    {
        if (info.BitsAllocated is not (8 or 16 or 32))
            throw CodecErrors.Unsupported(codec, $"Bits Allocated {info.BitsAllocated} (expected 8, 16 or 32)");
        if (output.Length != info.DecodedLength)
            throw new ArgumentException($"output is {output.Length} bytes; the frame needs {info.DecodedLength}", nameof(output));
        _output = output;
        _columns = info.Columns;
        _rows = info.Rows;
        _samples = info.SamplesPerPixel;
        _bytesPerSample = info.BitsAllocated / 8;
        _planar = info.PlanarConfiguration == 1 && info.SamplesPerPixel > 1;
    }

    /// <summary>
    /// Writes one row of one component, reading every <paramref name="valueStride"/>-th value; values are
    /// shifted left by <paramref name="shift"/> and taken modulo 2^(Bits Allocated).
    /// </summary>
    public void WriteRow(ReadOnlySpan<int> values, int component, int row, int shift, int valueStride = 1)
    {
        if (valueStride != 1)
        {
            for (int x = 0; x < _columns; x++) WriteSample(component, row * _columns + x, values[x * valueStride] << shift);
            return;
        }
        int pixelStart = row * _columns;
        int step = _planar ? 1 : _samples;
        int first = _planar ? component * _rows * _columns + pixelStart : pixelStart * _samples + component;
        switch (_bytesPerSample)
        {
            case 1:
                for (int x = 0, o = first; x < values.Length; x++, o += step) _output[o] = (byte)(values[x] << shift);
                break;
            case 2:
                for (int x = 0, o = first; x < values.Length; x++, o += step)
                    BinaryPrimitives.WriteUInt16LittleEndian(_output.Slice(o * 2, 2), (ushort)(values[x] << shift));
                break;
            default:
                for (int x = 0, o = first; x < values.Length; x++, o += step)
                    BinaryPrimitives.WriteInt32LittleEndian(_output.Slice(o * 4, 4), values[x] << shift);
                break;
        }
    }

    private void WriteSample(int component, int pixel, int value)
    {
        int o = _planar ? component * _rows * _columns + pixel : pixel * _samples + component;
        switch (_bytesPerSample)
        {
            case 1: _output[o] = (byte)value; break;
            case 2: BinaryPrimitives.WriteUInt16LittleEndian(_output.Slice(o * 2, 2), (ushort)value); break;
            default: BinaryPrimitives.WriteInt32LittleEndian(_output.Slice(o * 4, 4), value); break;
        }
    }
}
