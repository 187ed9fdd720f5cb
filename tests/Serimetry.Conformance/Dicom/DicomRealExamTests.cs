using System.Text.RegularExpressions;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Dicom;

/// <summary>
/// The 387 real prostate MRI files of shared/reference/mr (PROSTATEx, Siemens, ISO_IR 100): our header
/// values equal dcmtk's `dcmdump`, and our decoded pixels equal the Pixel Data dcmtk writes out.
/// Src: dcmtk 3.6.7 (dcmdump +P, dcmdump +W).
/// </summary>
public sealed partial class DicomRealExamTests
{
    private static readonly string[] Tags =
        ["0020,000e", "0020,0032", "0020,0037", "0028,0030", "0018,0050", "0008,103e", "0028,1052", "0028,1053", "0018,0024"];

    [Fact]
    public void Header_values_of_every_real_exam_file_equal_dcmdump()
    {
        var files = Directory.GetFiles(SharedReference.PathOf("mr"), "*.dcm", SearchOption.AllDirectories).Order(StringComparer.Ordinal).ToArray();
        Assert.True(files.Length > 300);
        var args = new List<string> { "-q", "+F", "+L" };
        foreach (var t in Tags) args.AddRange(["+P", t]);
        args.AddRange(files);
        var dump = ParseDump(ReferenceTool.Capture("dcmdump", [.. args]));
        var compared = 0;
        foreach (var path in files)
        {
            var ds = DicomFile.ReadHeader(path).Dataset;
            var expected = dump[path];
            foreach (var t in Tags)
            {
                var tag = DicomTag.Parse(t);
                Assert.Equal(expected.GetValueOrDefault(tag.Value), ds.GetStringOrNull(tag));
                compared++;
            }
        }
        Assert.Equal(files.Length * Tags.Length, compared);
    }

    [Fact]
    public void Private_text_stored_as_OB_reads_as_text()
    {
        // Src: dcmdump of this file prints (0019,100c) OB 31\36\30\30, i.e. the ASCII text "1600".
        var path = Directory.GetFiles(SharedReference.PathOf("mr", "ProstateX-0218"), "1-04.dcm", SearchOption.AllDirectories)
            .Single(p => p.Contains("CALCBVAL", StringComparison.Ordinal));
        var ds = DicomFile.ReadHeader(path).Dataset;
        Assert.Equal(DicomVR.OB, ds.Get(new DicomTag(0x0019, 0x100C)).VR);
        Assert.Equal("1600", ds.GetText(new DicomTag(0x0019, 0x100C)));
    }

    [Theory]
    [InlineData("ProstateX-0000")]
    [InlineData("ProstateX-0218")]
    public void Pixels_of_one_file_per_series_equal_dcmtk_output(string exam)
    {
        using var tmp = new ReferenceTool.TempDir();
        foreach (var series in Directory.GetDirectories(SharedReference.PathOf("mr", exam), "*", SearchOption.AllDirectories)
                     .Where(d => Directory.GetFiles(d, "*.dcm").Length > 0))
        {
            var path = Directory.GetFiles(series, "*.dcm").Order(StringComparer.Ordinal).First();
            var copy = tmp.File("in.dcm");
            File.Copy(path, copy, true);
            // dcmdump +W writes Pixel Data (little endian) to DIR as <file>.0.raw.
            ReferenceTool.Run("dcmdump", "-q", "+W", tmp.Path, copy);
            var raw = Directory.GetFiles(tmp.Path, "*.raw").Single();
            var reference = File.ReadAllBytes(raw);
            File.Delete(raw);
            var ours = DicomFile.ReadHeader(path).GetPixelData().GetFrameBytes(0);
            Assert.Equal(reference[..ours.Length], ours);
        }
    }

    private static Dictionary<string, Dictionary<uint, string>> ParseDump(string text)
    {
        var result = new Dictionary<string, Dictionary<uint, string>>();
        Dictionary<uint, string>? current = null;
        foreach (var line in text.Split('\n'))
        {
            var header = FileHeader().Match(line);
            if (header.Success)
            {
                current = result[header.Groups[1].Value.Trim()] = [];
                continue;
            }
            var m = ElementLine().Match(line);
            if (current is null || !m.Success) continue;
            var tag = DicomTag.Parse(m.Groups[1].Value).Value;
            current.TryAdd(tag, m.Groups[2].Value);
        }
        return result;
    }

    [GeneratedRegex(@"^# dcmdump \(\d+/\d+\): (.+)$")]
    private static partial Regex FileHeader();

    [GeneratedRegex(@"^\(([0-9a-fA-F]{4},[0-9a-fA-F]{4})\) \w\w \[(.*)\]\s+#")]
    private static partial Regex ElementLine();
}
