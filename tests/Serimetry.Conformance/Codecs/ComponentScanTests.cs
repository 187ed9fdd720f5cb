using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// Three-component JPEG lossless streams from the Stanford PVRG codec (Src: Debian pvrg-jpeg; -n writes one scan
/// per component, each after its own DHT, which dcmtk and GDCM never write; without -n the components are
/// interleaved), from 8-bit planes of ramps and seeded noise, 40x24. The stream is placed in a dcmtk-made RGB
/// JPEG Lossless file and decoded by dcmtk (dcmdjpeg) and GDCM (gdcmconv --raw); the engine must return their
/// samples (Src: dcmtk and GDCM decodes). PVRG's own input is not the reference: for some predictors its streams
/// decode, with all three decoders alike, to other values.
/// </summary>
public class ComponentScanTests
{
    private const int Width = 40, Height = 24;

    [Theory]
    [InlineData(1, true)]
    [InlineData(4, true)]
    [InlineData(7, true)]
    [InlineData(2, false)]
    [InlineData(6, false)]
    public void ComponentPlanesDecodeToTheEncoderInput(int predictor, bool separateScans)
    {
        var dir = ExternalTool.ScratchFolder();
        try
        {
            var random = new Random(40 + predictor);
            var planes = new byte[3][];
            var jpeg = Path.Combine(dir, "planes.jpg");
            var args = new List<string> { "-iw", $"{Width}", "-ih", $"{Height}", "-k", $"{predictor}", "-s", jpeg };
            if (separateScans) args.Add("-n");
            for (int c = 0; c < 3; c++)
            {
                planes[c] = new byte[Width * Height];
                for (int p = 0; p < planes[c].Length; p++)
                {
                    int x = p % Width, y = p / Width;
                    planes[c][p] = (byte)(x < 20 ? (x * (c + 1) + y * 3) % 256 : random.Next(256));
                }
                var raw = Path.Combine(dir, $"c{c}.raw");
                File.WriteAllBytes(raw, planes[c]);
                args.AddRange(["-ci", $"{c + 1}", raw]);
            }
            ExternalTool.Run("pvrg-jpeg", [.. args]);
            var stream = File.ReadAllBytes(jpeg);
            int scans = 0;
            for (int i = 0; i + 1 < stream.Length; i++) if (stream[i] == 0xFF && stream[i + 1] == 0xDA) scans++;
            Assert.Equal(separateScans ? 3 : 1, scans);

            var output = new byte[Width * Height * 3];
            new JpegLosslessDecoder().Decode(stream, new FrameInfo(Height, Width, 3, 8, 8, 0, 0), output);
            foreach (var reference in ReferenceDecodes(dir, stream)) Assert.Equal(reference, output);
            if (predictor == 1) Assert.Equal(Interleave(planes), output); // and here PVRG's input as well
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    private static byte[] Interleave(byte[][] planes)
    {
        var result = new byte[Width * Height * 3];
        for (int p = 0; p < Width * Height; p++)
            for (int c = 0; c < 3; c++) result[3 * p + c] = planes[c][p];
        return result;
    }

    /// <summary>dcmtk's and GDCM's decodes of the stream inside an RGB JPEG Lossless file of the same size.</summary>
    private static IEnumerable<byte[]> ReferenceDecodes(string dir, byte[] stream)
    {
        var bmp = Path.Combine(dir, "blank.bmp");
        int rowBytes = (Width * 3 + 3) / 4 * 4;
        var header = new byte[54];
        "BM"u8.CopyTo(header);
        BitConverter.TryWriteBytes(header.AsSpan(2), 54 + rowBytes * Height);
        BitConverter.TryWriteBytes(header.AsSpan(10), 54);
        BitConverter.TryWriteBytes(header.AsSpan(14), 40);
        BitConverter.TryWriteBytes(header.AsSpan(18), Width);
        BitConverter.TryWriteBytes(header.AsSpan(22), Height);
        BitConverter.TryWriteBytes(header.AsSpan(26), (short)1);
        BitConverter.TryWriteBytes(header.AsSpan(28), (short)24);
        File.WriteAllBytes(bmp, [.. header, .. new byte[rowBytes * Height]]);
        var blank = Path.Combine(dir, "blank.dcm");
        var container = Path.Combine(dir, "container.dcm");
        var wrapped = Path.Combine(dir, "wrapped.dcm");
        ExternalTool.Run("img2dcm", "-i", "BMP", bmp, blank);
        ExternalTool.Run("dcmcjpeg", "+el", "+sv", "1", blank, container);
        File.WriteAllBytes(wrapped, RestartIntervalTests.ReplaceSingleFragment(File.ReadAllBytes(container), stream));
        ExternalTool.Run("dcmdjpeg", wrapped, Path.Combine(dir, "dcmtk.dcm"));
        ExternalTool.Run("gdcmconv", "--raw", wrapped, Path.Combine(dir, "gdcm.dcm"));
        yield return PixelDataReader.Native(Path.Combine(dir, "dcmtk.dcm"));
        yield return PixelDataReader.Native(Path.Combine(dir, "gdcm.dcm"));
    }
}
