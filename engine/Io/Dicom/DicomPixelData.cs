using System.Buffers.Binary;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Pixel Data (7FE0,0010) with the attributes needed to decode it: native (PS3.5 8.1, 8.2) or
/// encapsulated (PS3.5 A.4) frames, decoded on demand to stored values (Bits Stored bits ending at
/// High Bit, sign-extended for Pixel Representation 1, PS3.5 8.1.1) or to rescaled values.
/// </summary>
public sealed partial class DicomPixelData
{
    private readonly ReadOnlyMemory<byte> _native;
    private readonly DicomFragments? _fragments;
    private readonly DicomVR _vr;
    private readonly DicomReadLog _log;
    private readonly IFrameDecoder? _decoder;
    private readonly DicomDataset _dataset;

    internal DicomPixelData(DicomDataset ds, DicomTransferSyntax ts, ReadOnlyMemory<byte> native, DicomFragments? fragments,
        DicomVR vr, DicomReadLog log)
    {
        _dataset = ds;
        _log = log;
        _vr = vr;
        TransferSyntax = ts;
        Info = DicomImagePixelInfo.From(ds);
        _fragments = fragments;
        _native = native;
        BigEndian = ds.BigEndian;
        if (fragments is not null)
        {
            if (ts.Uid != "1.2.840.10008.1.2.1.98") _decoder = CodecRegistry.Find(ts.Uid) ?? throw NoDecoder(ts, log.Source);
            if (vr != DicomVR.OB) log.Lenient($"encapsulated Pixel Data has VR {vr.Code()} (PS3.5 A.4 requires OB)");
        }
        else CheckNativeLength();
    }

    /// <summary>Image attributes.</summary>
    public DicomImagePixelInfo Info { get; }

    /// <summary>The transfer syntax of the pixels.</summary>
    public DicomTransferSyntax TransferSyntax { get; }

    /// <summary>True for compressed (encapsulated) Pixel Data.</summary>
    public bool IsEncapsulated => _fragments is not null;

    /// <summary>Native Pixel Data stored big endian (Explicit VR Big Endian).</summary>
    public bool BigEndian { get; }

    /// <summary>Number of frames.</summary>
    public int FrameCount => Info.Frames;

    /// <summary>
    /// One frame in native little-endian layout, Bits Allocated per sample, as an uncompressed Explicit
    /// VR Little Endian file would hold it; 1-bit frames are repacked from bit 0 of the first byte.
    /// </summary>
    public byte[] GetFrameBytes(int frame)
    {
        CheckFrame(frame);
        if (!IsEncapsulated) return NativeFrame(frame);
        try
        {
            return DecodeFrame(frame);
        }
        catch (Exception ex) when (ex is ArgumentException or IndexOutOfRangeException or OverflowException or InvalidDataException)
        {
            // Decoders must raise InputFormatException themselves; this keeps the contract if one does not.
            throw new InputFormatException($"frame {frame + 1} cannot be decoded ({TransferSyntax.Name}): {ex.Message}",
                _log.Source, "the compressed data is corrupt; obtain an uncompressed copy (`gdcmconv --raw in.dcm out.dcm`)", ex);
        }
    }

    /// <summary>Stored values of a frame (all samples, in stored order). 32-bit unsigned values are returned as their bit pattern.</summary>
    public int[] GetStoredValues(int frame)
    {
        var values = new int[Info.SamplesPerFrame];
        GetStoredValues(frame, values);
        return values;
    }

    /// <summary>Writes the stored values of a frame into <paramref name="destination"/> (length <see cref="DicomImagePixelInfo.SamplesPerFrame"/>).</summary>
    public void GetStoredValues(int frame, Span<int> destination)
    {
        if (destination.Length < Info.SamplesPerFrame)
            throw new ArgumentException($"destination holds {destination.Length} values; {Info.SamplesPerFrame} needed", nameof(destination));
        CheckFrame(frame);
        var dest = destination[..(int)Info.SamplesPerFrame];
        if (!IsEncapsulated && !BigEndian && Info.BitsAllocated != 1)
        {
            // Little-endian native frames are read in place, without a copy.
            var len = (int)Info.FrameBytes;
            DicomStoredValues.Extract(_native.Span.Slice(checked(frame * len), len), Info, dest);
            return;
        }
        DicomStoredValues.Extract(GetFrameBytes(frame), Info, dest);
    }

    /// <summary>Rescaled values (stored × Rescale Slope + Rescale Intercept, PS3.3 C.11.1.1.2), per-frame functional groups honoured.</summary>
    public float[] GetRescaledValues(int frame)
    {
        var result = new float[Info.SamplesPerFrame];
        GetRescaledValues(frame, result);
        return result;
    }

    /// <summary>Writes the rescaled values of a frame into <paramref name="destination"/> (length <see cref="DicomImagePixelInfo.SamplesPerFrame"/>).</summary>
    public void GetRescaledValues(int frame, Span<float> destination)
    {
        if (destination.Length < Info.SamplesPerFrame)
            throw new ArgumentException($"destination holds {destination.Length} values; {Info.SamplesPerFrame} needed", nameof(destination));
        var stored = GetStoredValues(frame);
        var (slope, intercept) = GetRescale(frame);
        var unsigned32 = Info.BitsAllocated == 32 && Info.PixelRepresentation == 0;
        for (var i = 0; i < stored.Length; i++)
            destination[i] = (float)((unsigned32 ? (uint)stored[i] : stored[i]) * slope + intercept);
    }

    /// <summary>Rescale Slope and Intercept of a frame (0-based).</summary>
    public (double Slope, double Intercept) GetRescale(int frame) => DicomFunctionalGroups.Rescale(_dataset, frame);

    private void CheckFrame(int frame)
    {
        if (frame < 0 || frame >= Info.Frames)
            throw new ArgumentOutOfRangeException(nameof(frame), frame, $"frame must be in 0..{Info.Frames - 1}");
    }

    private void CheckNativeLength()
    {
        var needed = Info.BitsAllocated == 1
            ? (Info.SamplesPerFrame * Info.Frames + 7) / 8
            : Info.FrameBytes * Info.Frames;
        if (_native.Length < needed)
            throw new InputFormatException(
                $"Pixel Data holds {_native.Length:N0} bytes; {Info.Rows}x{Info.Columns}x{Info.SamplesPerPixel} samples x {Info.Frames} frames at {Info.BitsAllocated} bits need {needed:N0}",
                _log.Source, "the file is truncated or its image attributes are wrong; re-export it");
        if (_native.Length > needed + 1)
            _log.Lenient($"Pixel Data holds {_native.Length - needed} bytes more than the image needs; the excess is ignored");
    }

    private byte[] NativeFrame(int frame)
    {
        if (Info.BitsAllocated == 1) return OneBitFrame(frame);
        var len = (int)Info.FrameBytes;
        var start = checked(frame * len);
        if (!BigEndian) return _native.Span.Slice(start, len).ToArray();
        // Swap whole 16-bit words: an odd-sized 8-bit frame shares its last word with the next frame or the pad byte.
        var first = start & ~1;
        var end = Math.Min(_native.Length, (start + len + 1) & ~1);
        var words = _native.Span[first..end].ToArray();
        SwapToLittleEndian(words);
        return words.AsSpan(start - first, len).ToArray();
    }

    /// <summary>
    /// Big Endian native data: OW words are byte-swapped 16-bit units (PS3.5 A.3), so 8-bit samples in
    /// OW are pair-swapped too; 32-bit samples are swapped as 32-bit units.
    /// </summary>
    private void SwapToLittleEndian(byte[] bytes)
    {
        if (Info.BitsAllocated == 32)
        {
            for (var i = 0; i + 4 <= bytes.Length; i += 4)
                BinaryPrimitives.WriteUInt32LittleEndian(bytes.AsSpan(i), BinaryPrimitives.ReadUInt32BigEndian(bytes.AsSpan(i)));
        }
        else if (Info.BitsAllocated == 16 || _vr == DicomVR.OW)
        {
            for (var i = 0; i + 2 <= bytes.Length; i += 2) (bytes[i], bytes[i + 1]) = (bytes[i + 1], bytes[i]);
        }
    }

    /// <summary>1-bit frames are packed with no padding between frames (PS3.5 8.1.1); repack from bit 0.</summary>
    private byte[] OneBitFrame(int frame)
    {
        var n = Info.SamplesPerFrame;
        var result = new byte[(n + 7) / 8];
        var src = _native.Span;
        var start = frame * n;
        if ((start & 7) == 0)
        {
            src.Slice((int)(start >> 3), result.Length).CopyTo(result);
            if ((n & 7) != 0) result[^1] &= (byte)((1 << (int)(n & 7)) - 1);
            return result;
        }
        for (long i = 0; i < n; i++)
        {
            var bit = start + i;
            if ((src[(int)(bit >> 3)] >> (int)(bit & 7) & 1) != 0) result[i >> 3] |= (byte)(1 << (int)(i & 7));
        }
        return result;
    }

    internal static UnsupportedInputException NoDecoder(DicomTransferSyntax ts, string where) =>
        new($"Pixel Data uses the transfer syntax {ts.Name} ({ts.Uid}){(ts.Lossy ? ", a lossy compression," : "")} which Serimetry cannot decode",
            where,
            "obtain an uncompressed copy: `gdcmconv --raw in.dcm out.dcm` (GDCM) or `dcmdjpeg` / `dcmdjpls` / `dcmdrle in.dcm out.dcm` (dcmtk), "
            + "or ask the PACS to send Explicit VR Little Endian (1.2.840.10008.1.2.1)");
}
