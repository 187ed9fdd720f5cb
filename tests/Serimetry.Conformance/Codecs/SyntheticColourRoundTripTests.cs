using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// A 98x61 RGB image with flat areas (run mode, long PackBits runs), smooth ramps and seeded noise, made into
/// DICOM by dcmtk's img2dcm and compressed by dcmtk and GDCM encoders (Src: dcmtk dcmcjpeg/dcmcjpls/dcmcrle,
/// GDCM gdcmconv). The engine's decode must equal img2dcm's uncompressed pixels, interleaved and by plane.
/// </summary>
public class SyntheticColourRoundTripTests
{
    private const int Width = 98, Height = 61; // even: GDCM 3.0 RLE aborts on odd-length RGB

    public static TheoryData<string> Commands =>
    [
        "dcmcjpeg +el +sv 1", "dcmcjpeg +el +sv 2", "dcmcjpeg +el +sv 3", "dcmcjpeg +el +sv 4", "dcmcjpeg +el +sv 5",
        "dcmcjpeg +el +sv 6", "dcmcjpeg +el +sv 7", "gdcmconv --jpeg",
        "dcmcjpls +il", "dcmcjpls +is", "dcmcjpls +in", "gdcmconv --jpegls",
        "dcmcrle", "gdcmconv --rle",
    ];

    [Theory]
    [MemberData(nameof(Commands))]
    public void DecodeEqualsUncompressedOriginal(string command)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var bmp = Path.Combine(dir, "colour.bmp");
            var original = Path.Combine(dir, "colour.dcm");
            var encoded = Path.Combine(dir, "encoded.dcm");
            File.WriteAllBytes(bmp, Bitmap());
            ExternalTool.Run("img2dcm", "-i", "BMP", bmp, original);
            var words = command.Split(' ');
            ExternalTool.Run(words[0], [.. words[1..], original, encoded]);

            var native = PixelDataReader.Native(original).AsSpan(0, Width * Height * 3).ToArray();
            var interleaved = new FrameInfo(Height, Width, 3, 8, 8, 0, 0);
            Assert.Equal(native, EncoderRoundTripTests.DecodeAll(encoded, interleaved, 1));

            var planar = interleaved with { PlanarConfiguration = 1 };
            var byPlane = new byte[native.Length];
            for (int p = 0; p < Width * Height; p++)
                for (int c = 0; c < 3; c++) byPlane[c * Width * Height + p] = native[3 * p + c];
            Assert.Equal(byPlane, EncoderRoundTripTests.DecodeAll(encoded, planar, 1));
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    /// <summary>A 24-bit bottom-up Windows bitmap (BITMAPINFOHEADER), rows padded to 4 bytes.</summary>
    private static byte[] Bitmap()
    {
        var random = new Random(20261201);
        int rowBytes = (Width * 3 + 3) / 4 * 4;
        var pixels = new byte[rowBytes * Height];
        for (int y = 0; y < Height; y++)
        {
            int o = (Height - 1 - y) * rowBytes;
            for (int x = 0; x < Width; x++, o += 3)
            {
                (int r, int g, int b) = x switch
                {
                    < 30 => (200, 40, y < 20 ? 40 : 41),
                    < 60 => (x * 4 % 256, y * 4 % 256, (x + y) * 2 % 256),
                    _ => (random.Next(256), random.Next(256), random.Next(256)),
                };
                pixels[o] = (byte)b;
                pixels[o + 1] = (byte)g;
                pixels[o + 2] = (byte)r;
            }
        }
        var header = new byte[54];
        "BM"u8.CopyTo(header);
        BitConverter.TryWriteBytes(header.AsSpan(2), 54 + pixels.Length);
        BitConverter.TryWriteBytes(header.AsSpan(10), 54);
        BitConverter.TryWriteBytes(header.AsSpan(14), 40);
        BitConverter.TryWriteBytes(header.AsSpan(18), Width);
        BitConverter.TryWriteBytes(header.AsSpan(22), Height);
        BitConverter.TryWriteBytes(header.AsSpan(26), (short)1);
        BitConverter.TryWriteBytes(header.AsSpan(28), (short)24);
        BitConverter.TryWriteBytes(header.AsSpan(34), pixels.Length);
        return [.. header, .. pixels];
    }
}
