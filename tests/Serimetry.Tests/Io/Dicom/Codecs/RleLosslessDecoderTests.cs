using System.Buffers.Binary;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Codecs;

/// <summary>
/// Hand-built RLE frames following DICOM PS3.5 Annex G (Src: PS3.5 G.3.1 PackBits rules and G.5 segment order,
/// worked by hand): header of 16 uint32, segments most significant byte first, colour by plane.
/// </summary>
public class RleLosslessDecoderTests
{
    private static readonly RleLosslessDecoder Decoder = new();

    private static byte[] Frame(params byte[][] segments)
    {
        var header = new byte[64];
        BinaryPrimitives.WriteUInt32LittleEndian(header, (uint)segments.Length);
        int offset = 64;
        for (int i = 0; i < segments.Length; i++)
        {
            BinaryPrimitives.WriteUInt32LittleEndian(header.AsSpan(4 + 4 * i), (uint)offset);
            offset += segments[i].Length;
        }
        return [.. header, .. segments.SelectMany(s => s)];
    }

    [Fact]
    public void PackBitsLiteralReplicateAndNoOp()
    {
        // 0x02 = literal of 3; 0xFD (-3) = replicate 4 times; 0x80 = no-op; 0x00 = literal of 1. G.3.1.
        var frame = Frame([0x02, 10, 20, 30, 0xFD, 7, 0x80, 0x00, 99]);
        var output = new byte[8];
        Decoder.Decode(frame, new FrameInfo(2, 4, 1, 8, 8, 0, 0), output);
        Assert.Equal(new byte[] { 10, 20, 30, 7, 7, 7, 7, 99 }, output);
    }

    [Fact]
    public void SixteenBitSegmentsAreMostSignificantFirst()
    {
        // Segment 1 holds the high bytes, segment 2 the low bytes (G.5): values 0x1234, 0xABCD.
        var frame = Frame([0x01, 0x12, 0xAB], [0x01, 0x34, 0xCD]);
        var output = new byte[4];
        Decoder.Decode(frame, new FrameInfo(1, 2, 1, 16, 16, 0, 0), output);
        Assert.Equal(0x1234, BinaryPrimitives.ReadUInt16LittleEndian(output));
        Assert.Equal(0xABCD, BinaryPrimitives.ReadUInt16LittleEndian(output.AsSpan(2)));
    }

    [Fact]
    public void ThirtyTwoBitUsesFourSegments()
    {
        var frame = Frame([0x00, 0x01], [0x00, 0x02], [0x00, 0x03], [0x00, 0x04]);
        var output = new byte[4];
        Decoder.Decode(frame, new FrameInfo(1, 1, 1, 32, 32, 0, 0), output);
        Assert.Equal(0x01020304u, BinaryPrimitives.ReadUInt32LittleEndian(output));
    }

    [Theory]
    [InlineData(0, new byte[] { 1, 4, 7, 2, 5, 8, 3, 6, 9 })]
    [InlineData(1, new byte[] { 1, 2, 3, 4, 5, 6, 7, 8, 9 })]
    public void ColourPlanesFollowPlanarConfiguration(int planar, byte[] expected)
    {
        // Red plane 1,2,3; green 4,5,6; blue 7,8,9 (RLE always stores colour by plane, G.2).
        var frame = Frame([0x02, 1, 2, 3], [0x02, 4, 5, 6], [0x02, 7, 8, 9]);
        var output = new byte[9];
        Decoder.Decode(frame, new FrameInfo(1, 3, 3, 8, 8, 0, planar), output);
        Assert.Equal(expected, output);
    }

    [Fact]
    public void RunsLongerThanTheFrameAreCutAndPaddingIgnored()
    {
        var frame = Frame([0xF9, 5, 0x00]); // replicate 8, frame holds 6; trailing pad byte
        var output = new byte[6];
        Decoder.Decode(frame, new FrameInfo(2, 3, 1, 8, 8, 0, 0), output);
        Assert.All(output, b => Assert.Equal(5, b));
    }

    public static TheoryData<byte[]> Malformed =>
    [
        new byte[10],                                  // shorter than the header
        Frame([0x02, 1, 2]),                           // literal runs past the segment
        Frame([0xFE]),                                 // replicate without its byte
        Frame([0x00, 1]),                              // segment too short for 4 pixels
        Frame([0x00, 1], [0x00, 2]),                   // two segments for an 8-bit grey frame
        BadOffset(),                                   // offset beyond the data
    ];

    private static byte[] BadOffset()
    {
        var frame = Frame([0xFD, 1]);
        BinaryPrimitives.WriteUInt32LittleEndian(frame.AsSpan(4), 5000);
        return frame;
    }

    [Theory]
    [MemberData(nameof(Malformed))]
    public void MalformedFramesGiveFormatErrors(byte[] frame)
    {
        var output = new byte[4];
        Assert.Throws<InputFormatException>(() => Decoder.Decode(frame, new FrameInfo(2, 2, 1, 8, 8, 0, 0), output));
    }

    [Fact]
    public void UnsupportedBitsAllocatedIsRefused()
    {
        var output = new byte[4];
        Assert.Throws<UnsupportedInputException>(() => Decoder.Decode(Frame([0x03, 1, 2, 3, 4]), new FrameInfo(2, 2, 1, 12, 12, 0, 0), output));
    }

    [Fact]
    public void WrongOutputLengthIsAnArgumentError()
    {
        var output = new byte[3];
        Assert.Throws<ArgumentException>(() => Decoder.Decode(Frame([0xFD, 1]), new FrameInfo(2, 2, 1, 8, 8, 0, 0), output));
    }
}
