using Serimetry.Tests.Cli;
using Serimetry.Cli;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Repeatability;

public sealed class QaVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-qa-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private static (int Code, string Out, string Err) Run(params string[] args) => CliRun.Run(args);

    [Fact]
    public void TestRetestWritesALoadableProfile()
    {
        var csv = Path.Combine(_dir, "t.csv");
        var lines = new List<string> { "subject,measure,repeat,value" };
        double[,] sf = { { 9, 2, 5, 8 }, { 6, 1, 3, 2 }, { 8, 4, 6, 8 }, { 7, 1, 2, 6 }, { 10, 5, 6, 9 }, { 6, 2, 4, 7 } };
        for (int i = 0; i < 6; i++)
            for (int j = 0; j < 4; j++) lines.Add($"S{i},rating,J{j},{sf[i, j]}");
        File.WriteAllLines(csv, lines);
        var outPath = Path.Combine(_dir, "p.json");
        var (code, stdout, _) = Run("qa", "test-retest", "--input", csv, "--out", outPath, "--date", "2026-12-01");
        Assert.Equal(0, code);
        Assert.Contains("rating", stdout);
        var entry = RepeatabilityProfile.Load(outPath).Find("rating")!;
        Assert.Equal("site QA run 2026-12-01", entry.Source);
        Assert.Contains("\"icc3k\"", File.ReadAllText(outPath));
    }

    [Fact]
    public void BadTableGivesExitCodeThreeAndOneLine()
    {
        var csv = Path.Combine(_dir, "bad.csv");
        File.WriteAllText(csv, "subject,measure,repeat,value\nA,m,1,x\n");
        var (code, _, err) = Run("qa", "test-retest", "--input", csv, "--out", Path.Combine(_dir, "p.json"));
        Assert.Equal(3, code);
        Assert.Contains("line 2", err);
        Assert.Single(err.Trim().Split('\n'));
    }

    [Fact]
    public void UnknownSubCommandIsAUsageError()
    {
        var (code, _, err) = Run("qa", "nonsense");
        Assert.Equal(2, code);
        Assert.Contains("test-retest", err);
    }
}

public sealed class QaDwiPhantomVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-dwi-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private string[] WritePhantom(double adc)
    {
        var dwi = Serimetry.Engine.Phantoms.IceWaterPhantom.Generate(new Serimetry.Engine.Core.Size3(40, 40, 3),
            new Serimetry.Engine.Core.Vec3(1.5, 1.5, 4), [0, 500, 900], 60, 5, adcUm2PerS: adc);
        var args = new List<string>();
        foreach (var d in dwi)
        {
            var f = Path.Combine(_dir, $"b{d.BValue}.nii.gz");
            Serimetry.Engine.Io.Nifti.NiftiFile.Write(f, d.Image);
            args.Add("--dwi");
            args.Add($"{d.BValue}={f}");
        }
        return [.. args];
    }

    [Fact]
    public void IceWaterPhantomPassesAndWarmWaterFails()
    {
        // Src: water at 0 °C = 1.099e-3 mm²/s (Holz et al. PCCP 2000 parameters; facts.md §2).
        var o = new StringWriter();
        int code = CliHost.Run(["qa", "dwi-phantom", .. WritePhantom(1099)], o, new StringWriter());
        Assert.Equal(0, code);
        Assert.Contains("PASS", o.ToString());
        code = CliHost.Run(["qa", "dwi-phantom", .. WritePhantom(2020)], new StringWriter(), new StringWriter());
        Assert.Equal(1, code);
        // The same warm scan passes when judged at its temperature (20 °C: 2.02e-3 mm²/s, facts.md §2).
        code = CliHost.Run(["qa", "dwi-phantom", "--temperature", "20", .. WritePhantom(2020)], new StringWriter(), new StringWriter());
        Assert.Equal(0, code);
    }

    [Fact]
    public void RepeatedExamsReportRepeatability()
    {
        var args = new List<string> { "qa", "dwi-phantom" };
        for (int scan = 0; scan < 2; scan++)
        {
            var dir = Path.Combine(_dir, $"scan{scan}");
            Directory.CreateDirectory(dir);
            var dwi = Serimetry.Engine.Phantoms.IceWaterPhantom.Generate(new Serimetry.Engine.Core.Size3(40, 40, 2),
                new Serimetry.Engine.Core.Vec3(1.5, 1.5, 4), [0, 500, 900], 60, 20 + scan);
            var entries = new List<string>();
            foreach (var d in dwi)
            {
                Serimetry.Engine.Io.Nifti.NiftiFile.Write(Path.Combine(dir, $"b{d.BValue}.nii.gz"), d.Image);
                entries.Add($"\"{d.BValue}\": \"b{d.BValue}.nii.gz\"");
            }
            File.WriteAllText(Path.Combine(dir, "exam.json"),
                $"{{\"patientId\": \"PH\", \"date\": \"2026-12-01\", \"series\": {{\"dwi\": {{{string.Join(",", entries)}}}}}}}");
            args.AddRange(["--exam", dir]);
        }
        var o = new StringWriter();
        Assert.Equal(0, CliHost.Run([.. args], o, new StringWriter()));
        Assert.Contains("repeatability over 2 scans", o.ToString());
    }
}
