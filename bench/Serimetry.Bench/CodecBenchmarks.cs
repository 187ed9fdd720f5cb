using System.Buffers.Binary;
using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Io.Dicom.Codecs;

namespace Serimetry.Bench;

/// <summary>
/// Frame decoding speed of the engine's codecs on the compressed files of shared/reference/dicom (one frame each).
/// Decoded MB/s = <see cref="FrameInfo.DecodedLength"/> / mean time. Run:
/// dotnet run -c Release --project bench/Serimetry.Bench -- --filter '*CodecBenchmarks*'
/// </summary>
[MemoryDiagnoser]
public class CodecBenchmarks
{
    private byte[] _frame = [];
    private byte[] _output = [];
    private FrameInfo _info = new(1, 1, 1, 8, 8, 0, 0);
    private IFrameDecoder _decoder = new RleLosslessDecoder();

    /// <summary>File name, transfer syntax, rows, columns, bits allocated, bits stored, pixel representation.</summary>
    [Params(
        "JPEGLossless_1s_1f_u_16_12.dcm|1.2.840.10008.1.2.4.57|1024|1024|16|12|0",
        "JPGLosslessP14SV1_1s_1f_8b.dcm|1.2.840.10008.1.2.4.70|768|1024|8|8|0",
        "JPEG-LL.dcm|1.2.840.10008.1.2.4.70|1024|256|16|16|1",
        "MR_small_RLE.dcm|1.2.840.10008.1.2.5|64|64|16|16|1",
        "MR_small_jpeg_ls_lossless.dcm|1.2.840.10008.1.2.4.80|64|64|16|16|1",
        "JLSL_16_15_1_1F.dcm|1.2.840.10008.1.2.4.80|128|128|16|15|1")]
    public string Case { get; set; } = "";

    [GlobalSetup]
    public void Setup()
    {
        var parts = Case.Split('|');
        _info = new FrameInfo(int.Parse(parts[2]), int.Parse(parts[3]), 1, int.Parse(parts[4]), int.Parse(parts[5]), int.Parse(parts[6]), 0);
        _decoder = CodecRegistry.Find(parts[1]) ?? throw new InvalidOperationException("no decoder for " + parts[1]);
        _frame = FirstFrame(File.ReadAllBytes(Path.Combine(ReferenceFolder(), "dicom", "files", parts[0])));
        _output = new byte[_info.DecodedLength];
    }

    [Benchmark]
    public void Decode() => _decoder.Decode(_frame, _info, _output);

    /// <summary>Concatenates the fragments after the Basic Offset Table (single-frame files).</summary>
    private static byte[] FirstFrame(byte[] file)
    {
        int at = file.AsSpan().LastIndexOf([(byte)0xE0, (byte)0x7F, (byte)0x10, (byte)0x00]) + 12;
        at += 8 + BinaryPrimitives.ReadInt32LittleEndian(file.AsSpan(at + 4));
        using var frame = new MemoryStream();
        while (at + 8 <= file.Length && BinaryPrimitives.ReadUInt16LittleEndian(file.AsSpan(at + 2)) == 0xE000)
        {
            int length = BinaryPrimitives.ReadInt32LittleEndian(file.AsSpan(at + 4));
            frame.Write(file, at + 8, length);
            at += 8 + length;
        }
        return frame.ToArray();
    }

    private static string ReferenceFolder()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var candidate = Path.Combine(d.FullName, "shared", "reference");
            if (Directory.Exists(candidate)) return candidate;
        }
        throw new DirectoryNotFoundException("shared/reference not found above " + AppContext.BaseDirectory);
    }
}
