using Serimetry.Tests.Cli;
using Serimetry.Engine.Phantoms;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Writing;

/// <summary><c>serimetry phantom --format dicom</c> end to end through the CLI host.</summary>
public sealed class PhantomDicomVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-phdcm-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private static (int Code, string Out, string Err) Run(params string[] args) => CliRun.Run(args);

    [Fact]
    public void Dicom_phantom_is_repeatable_and_inspect_finds_its_three_series()
    {
        var spec = Path.Combine(_dir, "spec.json");
        File.WriteAllText(spec, new PhantomSpec
        {
            Visits = 1,
            T2Grid = new PhantomGrid(48, 40, 10, 1.5, 1.5, 3),
            DwiGrid = new PhantomGrid(24, 20, 10, 3, 3, 3),
        }.ToJson());
        var a = Path.Combine(_dir, "a");
        var b = Path.Combine(_dir, "b");
        Assert.Equal(0, Run("phantom", "--out", a, "--spec", spec, "--format", "dicom").Code);
        Assert.Equal(0, Run("phantom", "--out", b, "--spec", spec, "--format", "dicom").Code);
        foreach (var rel in new[] { "visit-0/dicom/t2w/t2w-0001.dcm", "visit-0/dicom/dwi/dwi-0011.dcm", "visit-0/masks/seg.dcm" })
            Assert.Equal(File.ReadAllBytes(Path.Combine(a, rel)), File.ReadAllBytes(Path.Combine(b, rel)));
        var (code, output, _) = Run("inspect", Path.Combine(a, "visit-0"));
        Assert.Equal(0, code);
        // Roles come from the written attributes (RoleRules: SE with long TE/TR, b-values, Image Type ADC).
        Assert.Matches(@"\bt2w\s+48x40x10\s", output);
        Assert.Matches(@"\bdwi\s+24x20x10\s.*\b50,400,800,1400\b", output);
        Assert.Matches(@"\badc\s+24x20x10\s", output);
    }

    [Fact]
    public void Unknown_format_is_refused()
    {
        var (code, _, err) = Run("phantom", "--out", Path.Combine(_dir, "x"), "--format", "png");
        Assert.NotEqual(0, code);
        Assert.Contains("--format nifti or --format dicom", err, StringComparison.Ordinal);
    }
}
