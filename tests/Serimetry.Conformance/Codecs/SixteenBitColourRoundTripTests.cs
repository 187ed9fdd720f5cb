using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// 16-bit RGB, which the corpus lacks: MR_small.dcm turned by dcmtk's dcmodify into a 40x24 RGB image whose
/// pixels (flat runs, ramps, seeded full-range noise) come from a raw file, then compressed by dcmtk and GDCM
/// (Src: dcmtk dcmcjpls +il/+is/+in, dcmcjpeg, dcmcrle; GDCM gdcmconv). The engine's decode, interleaved and by
/// plane, must equal the uncompressed pixels (RLE: six byte segments; JPEG-LS: 16-bit contexts in all modes).
/// </summary>
public class SixteenBitColourRoundTripTests
{
    private const int Width = 40, Height = 24;

    [Theory]
    [InlineData("dcmcjpls +il")]
    [InlineData("dcmcjpls +is")]
    [InlineData("dcmcjpls +in")]
    [InlineData("gdcmconv --jpegls")]
    [InlineData("dcmcjpeg +el +sv 1")]
    [InlineData("dcmcjpeg +el +sv 7")]
    [InlineData("gdcmconv --jpeg")]
    [InlineData("dcmcrle")]
    [InlineData("gdcmconv --rle")]
    public void DecodeEqualsUncompressedOriginal(string command)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var raw = Path.Combine(dir, "rgb16.raw");
            var original = Path.Combine(dir, "rgb16.dcm");
            var encoded = Path.Combine(dir, "encoded.dcm");
            File.WriteAllBytes(raw, Pixels());
            File.Copy(ReferenceManifest.FilePath("MR_small.dcm"), original);
            ExternalTool.Run("dcmodify", "-nb", "-m", "(0028,0002)=3", "-i", "(0028,0006)=0", "-m", "(0028,0004)=RGB",
                "-m", $"(0028,0010)={Height}", "-m", $"(0028,0011)={Width}", "-m", "(0028,0103)=0", "-mf", $"(7fe0,0010)={raw}", original);
            var words = command.Split(' ');
            ExternalTool.Run(words[0], [.. words[1..], original, encoded]);

            var native = PixelDataReader.Native(original);
            var interleaved = new FrameInfo(Height, Width, 3, 16, 16, 0, 0);
            Assert.Equal(native, EncoderRoundTripTests.DecodeAll(encoded, interleaved, 1));
            var byPlane = new byte[native.Length];
            for (int p = 0; p < Width * Height; p++)
                for (int c = 0; c < 3; c++)
                    native.AsSpan(6 * p + 2 * c, 2).CopyTo(byPlane.AsSpan(2 * (c * Width * Height + p)));
            Assert.Equal(byPlane, EncoderRoundTripTests.DecodeAll(encoded, interleaved with { PlanarConfiguration = 1 }, 1));
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    private static byte[] Pixels()
    {
        var random = new Random(4016);
        var bytes = new byte[Width * Height * 6];
        for (int p = 0; p < Width * Height; p++)
        {
            int x = p % Width;
            for (int c = 0; c < 3; c++)
            {
                int value = x switch { < 12 => 30000 + c, < 26 => x * 1000 + c * 7, _ => random.Next(65536) };
                bytes[6 * p + 2 * c] = (byte)value;
                bytes[6 * p + 2 * c + 1] = (byte)(value >> 8);
            }
        }
        return bytes;
    }
}
