using System.Diagnostics;
using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Xunit;

namespace Serimetry.Conformance.Series;

/// <summary>
/// An Enhanced MR diffusion object written at test time by dcmtk's dump2dcm from a dump whose truth we set:
/// 6 frames = 3 positions (z 10, 14, 12 — not in order) × b 0 and 800 in the per-frame MR Diffusion macro,
/// orientation and pixel measures in the shared groups, rescale ×2 in per-frame Pixel Value Transformation.
/// Stored value of frame f, pixel (row j, column i) = 100 f + 5 j + i.
/// Src: PS3.3 C.7.6.16 (functional groups), C.8.13.5.9 (MR Diffusion); encoder: dcmtk dump2dcm.
/// </summary>
public sealed class EnhancedDiffusionTests : IDisposable
{
    private readonly string _tmp = Directory.CreateTempSubdirectory("serimetry-enh-").FullName;
    private static readonly int[] FrameZ = [10, 14, 12, 10, 14, 12];

    public void Dispose() => Directory.Delete(_tmp, true);

    [Fact]
    public void PerFrameDiffusionAndPlanesBecomeBValueStacks()
    {
        var file = Write();
        var series = Assert.Single(Assert.Single(StudyIndex.Build(file, DicomSliceHeaderReader.Default).Assemble()).Series);
        var m = series.Summary;
        Assert.Equal(SeriesRole.Dwi, m.Role);
        Assert.Equal([0.0, 800], m.BValues);
        Assert.Equal(new Size3(5, 4, 3), m.Size);
        Assert.Equal(new Vec3(0.6, 0.5, 2), m.SpacingMm);
        Assert.Equal(new Vec3(-1, -2, 10), m.OriginMm);
        Assert.All(series.MainStacks, s => Assert.Equal(BValueRules.StandardSource, s.BValueSource));

        var v = StackVolumeBuilder.Build(series, 800);
        int[] frameAtK = [3, 5, 4]; // b = 800 frames sorted by z: 10 (f3), 12 (f5), 14 (f4)
        for (int k = 0; k < 3; k++)
            for (int j = 0; j < 4; j++)
                for (int i = 0; i < 5; i++)
                    Assert.Equal(2f * (100 * frameAtK[k] + 5 * j + i), v[i, j, k]);
    }

    private string Write()
    {
        var d = new StringBuilder();
        void L(string s) => d.Append(s).Append('\n');
        void Seq(string tag, params string[] inner)
        {
            L($"({tag}) SQ (Sequence with undefined length #=1)");
            L("(fffe,e000) na (Item with undefined length #=1)");
            foreach (var s in inner) L(s);
            L("(fffe,e00d) na (ItemDelimitationItem)");
            L("(fffe,e0dd) na (SequenceDelimitationItem)");
        }
        L(@"(0008,0008) CS [ORIGINAL\PRIMARY\DIFFUSION\NONE]");
        L("(0008,0016) UI [1.2.840.10008.5.1.4.1.1.4.1]");
        L("(0008,0018) UI [2.25.111]");
        L("(0008,0060) CS [MR]");
        L("(0020,000d) UI [2.25.1]");
        L("(0020,000e) UI [2.25.2]");
        foreach (var s in new[] { "(0028,0002) US 1", "(0028,0004) CS [MONOCHROME2]", "(0028,0008) IS [6]", "(0028,0010) US 4",
                     "(0028,0011) US 5", "(0028,0100) US 16", "(0028,0101) US 16", "(0028,0102) US 15", "(0028,0103) US 0" }) L(s);
        L("(5200,9229) SQ (Sequence with undefined length #=1)");
        L("(fffe,e000) na (Item with undefined length #=2)");
        Seq("0020,9116", @"(0020,0037) DS [1\0\0\0\1\0]");
        Seq("0028,9110", @"(0028,0030) DS [0.5\0.6]", "(0018,0050) DS [3]");
        L("(fffe,e00d) na (ItemDelimitationItem)");
        L("(fffe,e0dd) na (SequenceDelimitationItem)");
        L("(5200,9230) SQ (Sequence with undefined length #=6)");
        for (int f = 0; f < 6; f++)
        {
            L("(fffe,e000) na (Item with undefined length #=3)");
            Seq("0020,9113", $@"(0020,0032) DS [-1\-2\{FrameZ[f]}]");
            Seq("0018,9117", $"(0018,9087) FD {(f < 3 ? 0 : 800)}", "(0018,9075) CS [ISOTROPIC]");
            Seq("0028,9145", "(0028,1052) DS [0]", "(0028,1053) DS [2]", "(0028,1054) LO [US]");
            L("(fffe,e00d) na (ItemDelimitationItem)");
        }
        L("(fffe,e0dd) na (SequenceDelimitationItem)");
        L("(7fe0,0010) OW =pixels.raw");
        var pixels = new byte[6 * 20 * 2];
        for (int f = 0; f < 6; f++)
            for (int px = 0; px < 20; px++)
                BitConverter.TryWriteBytes(pixels.AsSpan((f * 20 + px) * 2, 2), (ushort)(100 * f + px));
        File.WriteAllBytes(Path.Combine(_tmp, "pixels.raw"), pixels);
        File.WriteAllText(Path.Combine(_tmp, "enh.dump"), d.ToString());
        var psi = new ProcessStartInfo("dump2dcm") { WorkingDirectory = _tmp, RedirectStandardError = true };
        psi.ArgumentList.Add("--write-xfer-little");
        psi.ArgumentList.Add("enh.dump");
        psi.ArgumentList.Add("enh.dcm");
        using var p = Process.Start(psi)!;
        var err = p.StandardError.ReadToEnd();
        p.WaitForExit();
        Assert.True(p.ExitCode == 0, err);
        return Path.Combine(_tmp, "enh.dcm");
    }
}
