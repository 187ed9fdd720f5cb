using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Registration;

/// <summary>
/// Known-truth accuracy: the baseline and a moved follow-up are rendered from the same analytic pelvis
/// (independent Rician noise, different bias fields), so the true transform is known exactly.
/// Target (project requirement): mean gland TRE ≤ 0.5 mm for the rigid preset.
/// </summary>
public class RigidAccuracyTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(101)]
    [InlineData(102)]
    [InlineData(103)]
    [InlineData(104)]
    [InlineData(105)]
    [InlineData(106)]
    public void RigidPresetRecoversKnownMotion(int seed)
    {
        var pair = RigidCase.Make(seed);

        var result = Registrar.Register(pair.Fixed, pair.Moving, RegistrationOptions.Rigid(), pair.GlandMask);

        double tre = pair.GlandTre(result.Transform);
        double before = pair.GlandTre(AffineTransform.Identity);
        output.WriteLine($"seed {seed}: TRE {tre:F3} mm (identity {before:F1} mm), iterations {string.Join("/", result.IterationsPerLevel)}, " +
            $"stop {string.Join("/", result.Levels.Select(l => l.StopReason))}, {result.ElapsedSeconds:F2} s, warnings: {string.Join("; ", result.Warnings)}");
        Assert.True(tre <= 0.5, $"TRE {tre:F3} mm > 0.5 mm");
        Assert.True(result.MetricAfter < result.MetricBefore);
    }
}
