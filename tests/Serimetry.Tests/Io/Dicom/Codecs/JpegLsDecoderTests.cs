using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Codecs;

/// <summary>Hand-assembled JPEG-LS headers (Src: ITU-T T.87 C.2.2 frame and C.2.3 scan header syntax).</summary>
public class JpegLsDecoderTests
{
    private static readonly JpegLsDecoder Decoder = new();
    private static readonly FrameInfo Grey = new(2, 2, 1, 8, 8, 0, 0);

    private static byte[] Segment(int marker, byte[] payload) =>
        [0xFF, (byte)marker, (byte)((payload.Length + 2) >> 8), (byte)(payload.Length + 2), .. payload];

    private static byte[] Stream(int near, byte[]? extra = null) =>
        [0xFF, 0xD8, .. extra ?? [], .. Segment(0xF7, [8, 0, 2, 0, 2, 1, 1, 0x11, 0]),
         .. Segment(0xDA, [1, 1, 0, (byte)near, 0, 0]), 0x00, 0xFF, 0xD9];

    [Fact]
    public void NearLosslessScansAreRefusedNamingNear()
    {
        var error = Assert.Throws<UnsupportedInputException>(() => Decoder.Decode(Stream(3), Grey, new byte[4]));
        Assert.Contains("NEAR = 3", error.Message);
    }

    [Fact]
    public void ColourTransformExtensionIsRefused()
    {
        byte[] app8 = Segment(0xE8, [(byte)'m', (byte)'r', (byte)'f', (byte)'x', 1]);
        Assert.Throws<UnsupportedInputException>(() => Decoder.Decode(Stream(0, app8), Grey, new byte[4]));
    }

    [Fact]
    public void TruncatedScanDataIsAFormatError()
    {
        // One zero byte of scan data cannot hold four samples (the first Golomb code alone needs a 1 bit).
        Assert.Throws<InputFormatException>(() => Decoder.Decode(Stream(0), Grey, new byte[4]));
    }

    [Fact]
    public void FrameLargerThanTheDicomHeaderIsAFormatError()
    {
        Assert.Throws<InputFormatException>(() => Decoder.Decode(Stream(0), Grey with { Columns = 3 }, new byte[6]));
    }
}
