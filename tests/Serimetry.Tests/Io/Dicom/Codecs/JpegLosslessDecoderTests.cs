using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Codecs;

/// <summary>
/// Hand-assembled JPEG lossless codestreams (Src: ITU-T T.81 B.2 syntax, Table K.3 luminance DC Huffman table,
/// Table H.1 predictors and Table H.2 categories, encoded by hand).
/// </summary>
public class JpegLosslessDecoderTests
{
    private static readonly JpegLosslessDecoder Decoder = new();

    // Table K.3: code lengths 0,1,5,1,1,1,1,1,1 and values 0..11.
    private static readonly byte[] TableK3 =
        [0x00, 0, 1, 5, 1, 1, 1, 1, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11];

    private static byte[] Stream(int precision, int width, byte[] table, byte[] entropy, int predictor = 1)
    {
        var dht = Segment(0xC4, table);
        var sof = Segment(0xC3, [(byte)precision, 0, 1, (byte)(width >> 8), (byte)width, 1, 1, 0x11, 0]);
        var sos = Segment(0xDA, [1, 1, 0x00, (byte)predictor, 0, 0]);
        return [0xFF, 0xD8, .. dht, .. sof, .. sos, .. entropy, 0xFF, 0xD9];
    }

    private static byte[] Segment(int marker, byte[] payload) =>
        [0xFF, (byte)marker, (byte)((payload.Length + 2) >> 8), (byte)(payload.Length + 2), .. payload];

    [Fact]
    public void DecodesHandEncodedRowWithTableK3()
    {
        // 8-bit row 128,130,129,129, predictor 1: differences 0 (first sample predicted 2^7), +2, -1, 0.
        // Codes: 00 | 011 10 | 010 0 | 00, then 1-bits to the byte boundary: 0001 1100 1000 0111.
        var output = new byte[4];
        Decoder.Decode(Stream(8, 4, TableK3, [0x1C, 0x87]), new FrameInfo(1, 4, 1, 8, 8, 0, 0), output);
        Assert.Equal(new byte[] { 128, 130, 129, 129 }, output);
    }

    [Fact]
    public void CategorySixteenMeans32768WithoutExtraBits()
    {
        // Table: two 2-bit codes, 00 -> SSSS 0, 01 -> SSSS 16 (T.81 H.1.2.2). 16-bit row 0, 32768:
        // first prediction 2^15, difference 32768 mod 2^16 -> "01"; then Ra = 0, difference 32768 -> "01".
        byte[] table = [0x00, 0, 2, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 16];
        var output = new byte[4];
        Decoder.Decode(Stream(16, 2, table, [0x5F]), new FrameInfo(1, 2, 1, 16, 16, 0, 0), output);
        Assert.Equal(new byte[] { 0, 0, 0, 0x80 }, output);
    }

    [Fact]
    public void EveryTruncationIsAFormatError()
    {
        var stream = Stream(8, 4, TableK3, [0x1C, 0x87]);
        var output = new byte[4];
        for (int length = 0; length < stream.Length - 2; length++)
        {
            var cut = stream[..length];
            Assert.Throws<InputFormatException>(() => Decoder.Decode(cut, new FrameInfo(1, 4, 1, 8, 8, 0, 0), output));
        }
    }

    [Fact]
    public void LossyJpegIsRefusedByName()
    {
        var stream = Stream(8, 4, TableK3, [0x1C, 0x87]);
        int sof = Array.IndexOf(stream, (byte)0xC3);
        stream[sof] = 0xC1;
        var error = Assert.Throws<UnsupportedInputException>(() => Decoder.Decode(stream, new FrameInfo(1, 4, 1, 8, 8, 0, 0), new byte[4]));
        Assert.Contains("lossy", error.Message);
    }

    [Fact]
    public void FrameSizeDisagreeingWithTheDicomHeaderIsAFormatError()
    {
        var stream = Stream(8, 4, TableK3, [0x1C, 0x87]);
        Assert.Throws<InputFormatException>(() => Decoder.Decode(stream, new FrameInfo(1, 5, 1, 8, 8, 0, 0), new byte[5]));
        Assert.Throws<InputFormatException>(() => Decoder.Decode(stream, new FrameInfo(1, 4, 3, 8, 8, 0, 0), new byte[12]));
    }
}
