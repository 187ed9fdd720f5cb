using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// Uncompressed reference images compressed at test time by outside encoders (Src: dcmtk dcmcjpeg, dcmcjpls,
/// dcmcrle; GDCM gdcmconv) and decoded by the engine; the result must equal the uncompressed original's Pixel
/// Data byte for byte (lossless) or dcmtk's own decode (point transform).
/// </summary>
public class EncoderRoundTripTests
{
    // Explicit VR LE originals from the reference corpus: signed 16-bit MR, signed 16-bit CT, 3x3 RGB,
    // 10-frame 12-bit MR, and an 8-bit 512x512 image (deflated in the corpus; inflated with dcmconv first).
    private static readonly string[] Sources = ["MR_small.dcm", "CT_small.dcm", "SC_rgb_small_odd.dcm", "emri_small.dcm", "image_dfl.dcm"];

    public static TheoryData<string, string> JpegLosslessCases()
    {
        var data = new TheoryData<string, string>();
        foreach (var source in Sources)
        {
            for (int predictor = 1; predictor <= 7; predictor++) data.Add(source, $"dcmcjpeg +el +sv {predictor}");
            data.Add(source, "dcmcjpeg +e1");
            data.Add(source, "gdcmconv --jpeg");
        }
        return data;
    }

    public static TheoryData<string, string> RleAndJpegLsCases()
    {
        var data = new TheoryData<string, string>();
        foreach (var source in Sources)
        {
            data.Add(source, "dcmcrle");
            if (source != "SC_rgb_small_odd.dcm") data.Add(source, "gdcmconv --rle"); // GDCM 3.0 aborts on 27 bytes of RGB
            data.Add(source, "dcmcjpls");
            data.Add(source, "dcmcjpls +t1 5 +t2 20 +t3 70 +rs 32");
            data.Add(source, "gdcmconv --jpegls");
        }
        data.Add("SC_rgb_small_odd.dcm", "dcmcjpls +in");
        data.Add("SC_rgb_small_odd.dcm", "dcmcjpls +il");
        data.Add("SC_rgb_small_odd.dcm", "dcmcjpls +is");
        return data;
    }

    [Theory]
    [MemberData(nameof(JpegLosslessCases))]
    public void JpegLosslessEqualsOriginal(string source, string command) => RoundTrip(source, command);

    [Theory]
    [MemberData(nameof(RleAndJpegLsCases))]
    public void RleAndJpegLsEqualOriginal(string source, string command) => RoundTrip(source, command);

    [Theory]
    [InlineData("MR_small.dcm", 1, 2)]
    [InlineData("CT_small.dcm", 6, 3)]
    [InlineData("emri_small.dcm", 7, 1)]
    public void PointTransformEqualsDcmtkDecode(string source, int predictor, int pointTransform)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var original = Original(dir, source);
            var encoded = Path.Combine(dir, "pt.dcm");
            var reference = Path.Combine(dir, "pt-dcmtk.dcm");
            ExternalTool.Run("dcmcjpeg", "+el", "+sv", predictor.ToString(), "+pt", pointTransform.ToString(), original, encoded);
            ExternalTool.Run("dcmdjpeg", encoded, reference);
            var expected = PixelDataReader.Native(reference);
            var decoded = DecodeAll(encoded, source);
            Assert.Equal(expected.AsSpan(0, decoded.Length).ToArray(), decoded);
            Assert.NotEqual(PixelDataReader.Native(original).AsSpan(0, decoded.Length).ToArray(), decoded); // the transform did drop bits
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void NearLosslessJpegLsIsRefusedByName()
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var encoded = Path.Combine(dir, "near.dcm");
            ExternalTool.Run("dcmcjpls", "+en", Original(dir, "emri_small.dcm"), encoded); // dcmcjpls refuses signed input here
            Assert.Equal(JpegLsDecoder.NearLosslessUid, PixelDataReader.TransferSyntax(encoded));
            var error = Assert.Throws<UnsupportedInputException>(() => DecodeAll(encoded, "emri_small.dcm"));
            Assert.Contains("NEAR = 2", error.Message);
            Assert.Contains("1.2.840.10008.1.2.4.81", error.Message);
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    private static void RoundTrip(string source, string command)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var original = Original(dir, source);
            var encoded = Path.Combine(dir, "encoded.dcm");
            var words = command.Split(' ');
            ExternalTool.Run(words[0], [.. words[1..], original, encoded]);
            var decoded = DecodeAll(encoded, source);
            Assert.Equal(PixelDataReader.Native(original).AsSpan(0, decoded.Length).ToArray(), decoded);
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    internal static string Original(string dir, string source)
    {
        var path = ReferenceManifest.FilePath(source);
        if (source != "image_dfl.dcm") return path;
        var inflated = Path.Combine(dir, "inflated.dcm");
        ExternalTool.Run("dcmconv", "+te", path, inflated);
        return inflated;
    }

    internal static byte[] DecodeAll(string encoded, string source)
    {
        var row = ReferenceManifest.Row(source);
        return DecodeAll(encoded, row.Info(), row.Int("number_of_frames", 1));
    }

    internal static byte[] DecodeAll(string encoded, FrameInfo info, int frames)
    {
        var decoder = CodecRegistry.Find(PixelDataReader.TransferSyntax(encoded));
        Assert.NotNull(decoder);
        var fragments = PixelDataReader.Frames(encoded, frames);
        var all = new byte[info.DecodedLength * frames];
        for (int f = 0; f < frames; f++) decoder.Decode(fragments[f], info, all.AsSpan(f * info.DecodedLength, info.DecodedLength));
        return all;
    }
}
