using Serimetry.Cli;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Repeatability;

public sealed class QaVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-qa-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private (int Code, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = CliHost.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

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
