using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// JPEG lossless precisions below 8 bits (T.81 allows 2..16), which dcmtk and GDCM never write: 512x512 streams
/// from the Stanford PVRG codec (Src: Debian pvrg-jpeg, -p precision, -k predictor) of ramps and seeded noise,
/// placed in a dcmtk-made 8-bit JPEG Lossless file and decoded by dcmtk's dcmdjpeg (GDCM refuses a precision
/// below Bits Stored). The engine must return dcmtk's samples, which for predictors 1 and 4 are PVRG's input.
/// </summary>
public class LowPrecisionTests
{
    private const int Side = 512;

    [Theory]
    [InlineData(2, 1)]
    [InlineData(5, 4)]
    [InlineData(7, 1)]
    [InlineData(3, 7)]
    public void LowPrecisionDecodesLikeDcmtk(int precision, int predictor)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var random = new Random(precision * 10 + predictor);
            var samples = new byte[Side * Side];
            for (int i = 0; i < samples.Length; i++)
                samples[i] = (byte)(i % Side > Side / 2 ? random.Next(1 << precision) : (i % Side / 9) % (1 << precision));
            var raw = Path.Combine(dir, "samples.raw");
            var jpeg = Path.Combine(dir, "low.jpg");
            File.WriteAllBytes(raw, samples);
            ExternalTool.Run("pvrg-jpeg", "-iw", $"{Side}", "-ih", $"{Side}", "-k", $"{predictor}", "-p", $"{precision}", "-s", jpeg, raw);
            var stream = File.ReadAllBytes(jpeg);
            Assert.Equal(precision, stream[stream.AsSpan().IndexOf([(byte)0xFF, (byte)0xC3]) + 4]);

            var container = Path.Combine(dir, "container.dcm");
            var wrapped = Path.Combine(dir, "wrapped.dcm");
            ExternalTool.Run("dcmcjpeg", "+el", "+sv", "1", EncoderRoundTripTests.Original(dir, "image_dfl.dcm"), container);
            File.WriteAllBytes(wrapped, RestartIntervalTests.ReplaceSingleFragment(File.ReadAllBytes(container), stream));
            ExternalTool.Run("dcmdjpeg", wrapped, Path.Combine(dir, "dcmtk.dcm"));

            var output = new byte[Side * Side];
            new JpegLosslessDecoder().Decode(stream, new FrameInfo(Side, Side, 1, 8, 8, 0, 0), output);
            Assert.Equal(PixelDataReader.Native(Path.Combine(dir, "dcmtk.dcm")), output);
            if (predictor is 1 or 4) Assert.Equal(samples, output);
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }
}
