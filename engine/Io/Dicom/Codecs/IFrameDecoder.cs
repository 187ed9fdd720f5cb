namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>What a decoder needs to know about the frame it decodes (from the Image Pixel module).</summary>
/// <param name="Rows">Rows (0028,0010).</param>
/// <param name="Columns">Columns (0028,0011).</param>
/// <param name="SamplesPerPixel">Samples per Pixel (0028,0002).</param>
/// <param name="BitsAllocated">Bits Allocated (0028,0100).</param>
/// <param name="BitsStored">Bits Stored (0028,0101).</param>
/// <param name="PixelRepresentation">0 unsigned, 1 two's complement (0028,0103).</param>
/// <param name="PlanarConfiguration">0 interleaved, 1 by plane (0028,0006); decoders return this layout.</param>
public sealed record FrameInfo(int Rows, int Columns, int SamplesPerPixel, int BitsAllocated, int BitsStored,
    int PixelRepresentation, int PlanarConfiguration)
{
    /// <summary>Bytes of one decoded frame, little endian, Bits Allocated per sample.</summary>
    public int DecodedLength => checked(Rows * Columns * SamplesPerPixel * Math.Max(1, BitsAllocated / 8));
}

/// <summary>
/// Decodes one compressed frame (the concatenated fragments of that frame) into the native little-endian
/// layout an uncompressed Explicit VR Little Endian file would hold. Malformed data throws
/// <see cref="Core.InputFormatException"/>; it never hangs and never writes past the output.
/// </summary>
public interface IFrameDecoder
{
    /// <summary>Transfer syntax UIDs this decoder handles.</summary>
    IReadOnlyList<string> TransferSyntaxUids { get; }

    /// <summary>Decodes one frame into <paramref name="output"/> (length <see cref="FrameInfo.DecodedLength"/>).</summary>
    void Decode(ReadOnlySpan<byte> compressed, FrameInfo info, Span<byte> output);
}
