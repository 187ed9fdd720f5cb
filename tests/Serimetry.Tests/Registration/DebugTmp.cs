using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Registration;

public class DebugTmp(ITestOutputHelper output)
{
    [Theory]
    [InlineData(101, 0.0)]
    [InlineData(101, 0.15)]
    [InlineData(102, 0.15)]
    public void Probe(int seed, double bias)
    {
        var grid = RegistrationPhantom.T2Grid();
        var truth = RegistrationPhantom.RandomRigid(seed);
        var fixedImage = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.03, seed, bias: bias);
        var moving = RegistrationPhantom.Render(grid, truth, PhantomContrast.T2w, 0.03, seed + 5000, bias: bias);
        var mask = RegistrationPhantom.GlandMask(grid);
        var o = RegistrationOptions.Rigid();
        var r = Registrar.Register(fixedImage, moving, o, mask);
        output.WriteLine($"TRE {RegistrationPhantom.GlandTre(grid, r.Transform, truth):F3} {r.ElapsedSeconds:F2}s");
        var wd = Path.Combine(Path.GetTempPath(), $"elx-{seed}-{bias}");
        var e = ElastixReference.Run(fixedImage, moving, MaskOperations.DilateBox(mask, 20),
            new ElastixReference.Schedule([4, 4, 1, 2, 2, 1, 1, 1, 1], [4000, 10000, 40000], 200, 32), wd);
        output.WriteLine($"ELX TRE {RegistrationPhantom.GlandTre(grid, e.Transform, truth):F3} {e.WallSeconds:F2}s");
        foreach (var l in r.Levels) output.WriteLine(l.ToString());
    }
}
