using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// 16-bit extremes the corpus lacks: MR_small.dcm's 64x64 pixels replaced by (a) a 0 / 32768 checkerboard,
/// whose differences are exactly 32768 (T.81 H.1.2.2: SSSS = 16 with no extra bits) and (b) seeded full-range
/// noise (every difference category, modulo-2^16 prediction), compressed by outside encoders (Src: dcmtk
/// dcmcjpeg/dcmcjpls/dcmcrle, GDCM gdcmconv) and decoded by the engine to the patched original's bytes.
/// </summary>
public class FullRangeRoundTripTests
{
    public static TheoryData<string, string> Cases()
    {
        var data = new TheoryData<string, string>();
        foreach (var pattern in new[] { "checkerboard", "noise" })
        {
            for (int predictor = 1; predictor <= 7; predictor++) data.Add(pattern, $"dcmcjpeg +el +sv {predictor}");
            data.Add(pattern, "gdcmconv --jpeg");
            data.Add(pattern, "dcmcjpls");
            data.Add(pattern, "gdcmconv --jpegls");
            data.Add(pattern, "dcmcrle");
        }
        return data;
    }

    /// <summary>
    /// 32-bit samples: MR_small.dcm re-labelled in place as 32 rows of 64 signed 32-bit samples (Bits Allocated /
    /// Stored 32, High Bit 31, same 8192 bytes) filled with seeded full-range noise, RLE-encoded by dcmtk and GDCM.
    /// </summary>
    [Theory]
    [InlineData("dcmcrle")]
    [InlineData("gdcmconv --rle")]
    public void ThirtyTwoBitRleRoundTrips(string command)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var source = ReferenceManifest.FilePath("MR_small.dcm");
            var file = File.ReadAllBytes(source);
            var native = PixelDataReader.Native(source);
            int start = file.AsSpan().LastIndexOf(native);
            PatchUs(file, 0x0010, 32);
            PatchUs(file, 0x0100, 32);
            PatchUs(file, 0x0101, 32);
            PatchUs(file, 0x0102, 31);
            new Random(32).NextBytes(file.AsSpan(start, native.Length));
            for (int i = 0; i < 64; i++) file[start + 4 * i + 3] = 0; // a zero run in the top byte plane
            var original = Path.Combine(dir, "thirty-two.dcm");
            var encoded = Path.Combine(dir, "encoded.dcm");
            File.WriteAllBytes(original, file);
            var words = command.Split(' ');
            ExternalTool.Run(words[0], [.. words[1..], original, encoded]);
            var info = new Serimetry.Engine.Io.Dicom.Codecs.FrameInfo(32, 64, 1, 32, 32, 1, 0);
            Assert.Equal(PixelDataReader.Native(original), EncoderRoundTripTests.DecodeAll(encoded, info, 1));
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    /// <summary>Overwrites the value of an Explicit VR LE (0028,xxxx) US element.</summary>
    private static void PatchUs(byte[] file, int element, int value)
    {
        byte[] tag = [0x28, 0x00, (byte)element, (byte)(element >> 8), (byte)'U', (byte)'S', 2, 0];
        int at = file.AsSpan().IndexOf(tag);
        Assert.True(at > 0, $"(0028,{element:X4}) not found");
        file[at + 8] = (byte)value;
        file[at + 9] = (byte)(value >> 8);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void ExtremeSixteenBitValuesRoundTrip(string pattern, string command)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var source = ReferenceManifest.FilePath("MR_small.dcm");
            var file = File.ReadAllBytes(source);
            var native = PixelDataReader.Native(source);
            int start = file.AsSpan().LastIndexOf(native); // the native bytes sit at the end of the element
            var random = new Random(16);
            for (int i = 0; i < native.Length / 2; i++)
            {
                int value = pattern == "noise" ? random.Next(65536) : ((i / 64 + i % 64) & 1) * 32768;
                file[start + 2 * i] = (byte)value;
                file[start + 2 * i + 1] = (byte)(value >> 8);
            }
            var original = Path.Combine(dir, "patched.dcm");
            var encoded = Path.Combine(dir, "encoded.dcm");
            File.WriteAllBytes(original, file);
            var words = command.Split(' ');
            ExternalTool.Run(words[0], [.. words[1..], original, encoded]);
            Assert.Equal(PixelDataReader.Native(original), EncoderRoundTripTests.DecodeAll(encoded, "MR_small.dcm"));
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }
}
