using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// Robustness: the first frame of every compressed reference file, truncated or with bytes flipped (seeded,
/// bounded count), must either decode or raise an input error (format, or unsupported when a flip turns the
/// stream into another JPEG process); never another exception, never a hang (common practice for decoder fuzzing).
/// </summary>
public class CorruptStreamTests
{
    public static TheoryData<string> Files =>
    [
        "MR_small_RLE.dcm", "emri_small_RLE.dcm", "JPEG-LL.dcm", "JPEGLossless_1s_1f_u_16_12.dcm",
        "JPGLosslessP14SV1_1s_1f_8b.dcm", "MR_small_jpeg_ls_lossless.dcm", "emri_small_jpeg_ls_lossless.dcm",
        "JLSL_08_07_0_1F.dcm", "JLSL_16_15_1_1F.dcm",
    ];

    [Theory]
    [MemberData(nameof(Files))]
    public void TruncatedFramesFailCleanly(string file)
    {
        var (frame, info, decoder) = Load(file);
        var output = new byte[info.DecodedLength];
        var random = new Random(file.Length);
        var lengths = new List<int> { 0, 1, 2, 3, 63, 64, 65, frame.Length / 2, frame.Length - 3 };
        for (int i = 0; i < 25; i++) lengths.Add(random.Next(frame.Length - 2));
        foreach (int length in lengths.Where(l => l >= 0 && l < frame.Length - 2))
            Assert.Throws<InputFormatException>(() => decoder.Decode(frame.AsSpan(0, length), info, output));
    }

    [Theory]
    [MemberData(nameof(Files))]
    public void FlippedBytesDecodeOrFailCleanly(string file)
    {
        var (frame, info, decoder) = Load(file);
        var output = new byte[info.DecodedLength];
        var random = new Random(1000 + file.Length);
        int decoded = 0, refused = 0;
        for (int trial = 0; trial < 60; trial++)
        {
            var damaged = (byte[])frame.Clone();
            int flips = 1 + random.Next(8);
            bool header = trial % 3 == 0; // a third of the trials damage the first 200 bytes (headers, tables)
            for (int f = 0; f < flips; f++)
                damaged[random.Next(header ? Math.Min(200, damaged.Length) : damaged.Length)] ^= (byte)(1 << random.Next(8));
            try
            {
                decoder.Decode(damaged, info, output);
                decoded++;
            }
            catch (InputException e) when (e is InputFormatException or UnsupportedInputException)
            {
                refused++;
            }
        }
        Assert.Equal(60, decoded + refused);
    }

    private static (byte[] Frame, FrameInfo Info, IFrameDecoder Decoder) Load(string file)
    {
        var row = ReferenceManifest.Row(file);
        var decoder = CodecRegistry.Find(row["transfer_syntax_uid"]) ?? throw new InvalidOperationException("no decoder");
        var frame = PixelDataReader.Frames(ReferenceManifest.FilePath(file), row.Int("number_of_frames", 1))[0];
        // End JPEG streams at their EOI (dropping fragment padding) so that every length shorter than the
        // stream minus EOI really cuts coded data.
        int end = decoder is RleLosslessDecoder ? frame.Length : frame.AsSpan().LastIndexOf([(byte)0xFF, (byte)0xD9]) + 2;
        return (frame[..end], row.Info(), decoder);
    }
}
