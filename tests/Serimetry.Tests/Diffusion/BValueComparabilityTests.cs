using Serimetry.Engine.Diffusion;
using Xunit;

namespace Serimetry.Tests.Diffusion;

public sealed class BValueComparabilityTests
{
    [Fact]
    public void DifferentBValueSetsAreReported()
    {
        Assert.Null(BValueComparability.Compare([400, 800], [800, 400, 400]));
        var msg = BValueComparability.Compare([400, 800], [500, 1000]);
        Assert.NotNull(msg);
        Assert.Contains("400/800", msg);
        Assert.Contains("500/1000", msg);
    }
}

public sealed class AdcVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-adc-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    [Fact]
    public void AdcVerbWritesTheMapOfAPhantomExam()
    {
        // Outside truth: the phantom's known water ADC at 0 °C (1099 ×10^-6 mm²/s, facts.md §2), noise-free.
        var dwi = Serimetry.Engine.Phantoms.IceWaterPhantom.Generate(new Serimetry.Engine.Core.Size3(20, 20, 2),
            new Serimetry.Engine.Core.Vec3(2, 2, 4), [0, 500, 900], 1e9, 1);
        var args = new List<string> { "adc", "--out", Path.Combine(_dir, "adc.nii.gz"), "--method", "lls" };
        foreach (var d in dwi)
        {
            var f = Path.Combine(_dir, $"b{d.BValue}.nii.gz");
            Serimetry.Engine.Io.Nifti.NiftiFile.Write(f, d.Image);
            args.AddRange(["--dwi", $"{d.BValue}={f}"]);
        }
        Assert.Equal(0, Serimetry.Cli.CliHost.Run([.. args], new StringWriter(), new StringWriter()));
        var adc = Serimetry.Engine.Io.Nifti.NiftiFile.Read(Path.Combine(_dir, "adc.nii.gz")).Volume;
        Assert.Equal(1099, adc[10, 10, 0], 1099 * 1e-5);
        var err = new StringWriter();
        Assert.Equal(3, Serimetry.Cli.CliHost.Run([.. args, "--b-values", "500,1000"], new StringWriter(), err));
        Assert.Contains("1000", err.ToString());
    }
}
