using System.Buffers.Binary;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// JPEG lossless streams with restart intervals (DRI and RST0..RST7 cycling), which the dcmtk and GDCM encoders do
/// not write, made by the Stanford PVRG codec (Debian pvrg-jpeg: -k predictor, -r interval in MCUs, -p precision,
/// raw big-endian 16-bit input) from MR_small.dcm's pixels. The stream is placed in a dcmtk-made JPEG Lossless
/// file and decoded by dcmtk (dcmdjpeg) and GDCM (gdcmconv --raw); the engine must return the same samples
/// (Src: dcmtk and GDCM decodes). PVRG resets prediction differently at restarts from T.81 H.1.2.1, so its own
/// input is not the reference here; dcmtk, GDCM and the engine agree on the standard reading.
/// </summary>
public class RestartIntervalTests
{
    private const int Side = 64;

    [Theory]
    [InlineData(1, 64)]
    [InlineData(4, 64)]
    [InlineData(7, 128)]
    [InlineData(5, 192)]
    [InlineData(6, 512)]
    [InlineData(2, 64)]
    public void RestartIntervalsDecodeLikeDcmtkAndGdcm(int predictor, int interval)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var source = ReferenceManifest.FilePath("MR_small.dcm");
            var native = PixelDataReader.Native(source);
            var raw = new byte[native.Length];
            for (int i = 0; i < Side * Side; i++) BinaryPrimitives.WriteUInt16BigEndian(raw.AsSpan(2 * i), BinaryPrimitives.ReadUInt16LittleEndian(native.AsSpan(2 * i)));
            File.WriteAllBytes(Path.Combine(dir, "mr.raw"), raw);
            var jpeg = Path.Combine(dir, "restart.jpg");
            ExternalTool.Run("pvrg-jpeg", "-iw", $"{Side}", "-ih", $"{Side}", "-k", $"{predictor}", "-r", $"{interval}", "-p", "12", "-s", jpeg, Path.Combine(dir, "mr.raw"));
            var stream = File.ReadAllBytes(jpeg);
            Assert.True(stream.AsSpan().IndexOf([(byte)0xFF, (byte)(interval <= 448 ? 0xD7 : 0xD0)]) > 0, "the stream should hold restart markers (cycling past RST7 when there are 8 or more)");

            var container = Path.Combine(dir, "container.dcm");
            var wrapped = Path.Combine(dir, "wrapped.dcm");
            ExternalTool.Run("dcmcjpeg", "+el", "+sv", "1", source, container);
            File.WriteAllBytes(wrapped, ReplaceSingleFragment(File.ReadAllBytes(container), stream));
            ExternalTool.Run("dcmdjpeg", wrapped, Path.Combine(dir, "dcmtk.dcm"));
            ExternalTool.Run("gdcmconv", "--raw", wrapped, Path.Combine(dir, "gdcm.dcm"));

            var info = new FrameInfo(Side, Side, 1, 16, 12, 0, 0);
            var output = new byte[info.DecodedLength];
            new JpegLosslessDecoder().Decode(stream, info, output);
            Assert.Equal(PixelDataReader.Native(Path.Combine(dir, "dcmtk.dcm")), output);
            Assert.Equal(PixelDataReader.Native(Path.Combine(dir, "gdcm.dcm")), output);
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    /// <summary>Replaces the fragments after the Basic Offset Table of the last Pixel Data element by one fragment.</summary>
    internal static byte[] ReplaceSingleFragment(byte[] file, byte[] stream)
    {
        int at = file.AsSpan().LastIndexOf([(byte)0xE0, (byte)0x7F, (byte)0x10, (byte)0x00, (byte)'O', (byte)'B']);
        int table = at + 12;
        int fragments = table + 8 + BinaryPrimitives.ReadInt32LittleEndian(file.AsSpan(table + 4));
        var padded = stream.Length % 2 == 0 ? stream : [.. stream, 0];
        var item = new byte[8];
        BinaryPrimitives.WriteUInt32LittleEndian(item, 0xE000FFFE);
        BinaryPrimitives.WriteInt32LittleEndian(item.AsSpan(4), padded.Length);
        byte[] end = [0xFE, 0xFF, 0xDD, 0xE0, 0, 0, 0, 0];
        return [.. file.AsSpan(0, fragments), .. item, .. padded, .. end];
    }
}
