using System.Text;
using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Bench;

/// <summary>
/// DICOM reader kernels: header-only indexing of a 1,000-file folder (the synthetic oblique series,
/// copied 100 times) and full decoding of an uncompressed 512x512 16-bit slice held in memory.
/// </summary>
[MemoryDiagnoser]
public class DicomBenchmarks
{
    private string _folder = "";
    private string[] _files = [];
    private byte[] _slice = [];

    [GlobalSetup]
    public void Setup()
    {
        var source = FindReference("dicom", "series-oblique");
        _folder = Directory.CreateTempSubdirectory("serimetry-bench-dicom-").FullName;
        var originals = Directory.GetFiles(source, "*.dcm");
        for (var copy = 0; copy < 100; copy++)
            foreach (var f in originals)
                File.Copy(f, Path.Combine(_folder, $"c{copy:D3}_{Path.GetFileName(f)}"));
        _files = Directory.GetFiles(_folder);
        _slice = SyntheticSlice(512, 512);
    }

    [GlobalCleanup]
    public void Cleanup() => Directory.Delete(_folder, true);

    /// <summary>Reads the headers of 1,000 files (stops at Pixel Data).</summary>
    [Benchmark]
    public int IndexThousandHeaders()
    {
        var n = 0;
        foreach (var f in _files) n += DicomFile.ReadHeader(f).Dataset.Elements.Count;
        return n;
    }

    /// <summary>Parses a 512x512x16-bit slice (512 KiB of pixels) and extracts its stored values.</summary>
    [Benchmark]
    public int DecodeUncompressedSlice()
    {
        var px = DicomFile.Read(_slice.AsMemory()).GetPixelData();
        return px.GetStoredValues(0)[1000];
    }

    private static byte[] SyntheticSlice(int rows, int columns)
    {
        using var ms = new MemoryStream();
        using var w = new BinaryWriter(ms);
        w.Write(new byte[128]);
        w.Write("DICM"u8);
        Element(w, 0x0002, 0x0010, "UI", Encoding.ASCII.GetBytes("1.2.840.10008.1.2.1\0"));
        Element(w, 0x0028, 0x0002, "US", BitConverter.GetBytes((ushort)1));
        Element(w, 0x0028, 0x0004, "CS", Encoding.ASCII.GetBytes("MONOCHROME2 "));
        Element(w, 0x0028, 0x0010, "US", BitConverter.GetBytes((ushort)rows));
        Element(w, 0x0028, 0x0011, "US", BitConverter.GetBytes((ushort)columns));
        Element(w, 0x0028, 0x0100, "US", BitConverter.GetBytes((ushort)16));
        Element(w, 0x0028, 0x0101, "US", BitConverter.GetBytes((ushort)12));
        Element(w, 0x0028, 0x0102, "US", BitConverter.GetBytes((ushort)11));
        Element(w, 0x0028, 0x0103, "US", BitConverter.GetBytes((ushort)0));
        var pixels = new byte[rows * columns * 2];
        new Random(5).NextBytes(pixels);
        w.Write((ushort)0x7FE0);
        w.Write((ushort)0x0010);
        w.Write("OW"u8);
        w.Write((ushort)0);
        w.Write(pixels.Length);
        w.Write(pixels);
        w.Flush();
        return ms.ToArray();
    }

    private static void Element(BinaryWriter w, ushort g, ushort e, string vr, byte[] value)
    {
        w.Write(g);
        w.Write(e);
        w.Write(Encoding.ASCII.GetBytes(vr));
        w.Write((ushort)value.Length);
        w.Write(value);
    }

    private static string FindReference(params string[] parts)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var candidate = Path.Combine([d.FullName, "shared", "reference", .. parts]);
            if (Directory.Exists(candidate)) return candidate;
        }
        throw new DirectoryNotFoundException("shared/reference not found above " + AppContext.BaseDirectory);
    }
}
