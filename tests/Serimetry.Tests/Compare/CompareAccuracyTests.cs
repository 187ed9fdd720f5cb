using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Compare;

/// <summary>
/// The must-show accuracy of the comparison on a seeded set of phantom subjects with known truth (Src: the phantom
/// generator's analytic lesion volumes, rigid motion and tissue ADCs in truth.json; <see cref="CompareAccuracyFixture"/>),
/// in NIfTI and DICOM form.
/// </summary>
public sealed class CompareAccuracyTests(CompareAccuracyFixture fx, ITestOutputHelper output) : IClassFixture<CompareAccuracyFixture>
{
    public static TheoryData<string> Formats => new() { "NIfTI", "DICOM" };

    private IReadOnlyList<AccuracyCase> Cases(string format) => format == "DICOM" ? fx.Dicom : fx.Nifti;

    [Theory]
    [MemberData(nameof(Formats))]
    public void LesionVolumeChangeFollowsTheTrueGrowth(string format)
    {
        // Truth: analytic lesion volumes (4/3·π·r³ per visit); issue 5: relative change within ±10 % for lesions ≥ 0.2 mL.
        foreach (var c in Cases(format))
        {
            double trueRatio = c.TrueVolumeMl[1] / c.TrueVolumeMl[0];
            output.WriteLine($"{c.Name}: volume ratio {c.Ratio("lesion.volume"):F3} (true {trueRatio:F3})");
            Assert.True(c.TrueVolumeMl[0] >= 0.2, c.Name);
            Assert.InRange(c.Ratio("lesion.volume") / trueRatio, 0.90, 1.10);
        }
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void AbsoluteLesionVolumeIsNearTheAnalyticVolume(string format)
    {
        // Truth: analytic lesion volume. The partial-volume occupancy keeps the thin 3 mm cap slices that a binary
        // outline drops (docs/measures.md); measured 0.98-1.01 of truth on the demo-size sweep. Asserted within ±5 %.
        foreach (var c in Cases(format))
            for (int k = 0; k < 2; k++)
                Assert.InRange(c.Values[k]["lesion.volume"]!.Value / c.TrueVolumeMl[k], 0.95, 1.05);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void GlandVolumeIsUnchanged(string format)
    {
        // Truth: rigid motion only, the gland is unchanged (ratio 1); issue 5: within ±5 %.
        foreach (var c in Cases(format)) Assert.InRange(c.Ratio("gland.volume"), 0.95, 1.05);
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void LesionMedianAdcChangeIsWithinFivePercent(string format)
    {
        // Truth: the lesion tissue keeps ADC 800 ×10⁻⁶ mm²/s at every visit (ratio 1); issue 5: within ±5 %.
        foreach (var c in Cases(format))
        {
            output.WriteLine($"{c.Name}: median ADC {c.Values[0]["lesion.adc.median"]:F0} -> {c.Values[1]["lesion.adc.median"]:F0}");
            Assert.InRange(c.Ratio("lesion.adc.median"), 0.95, 1.05);
        }
    }

    [Theory]
    [MemberData(nameof(Formats))]
    public void RefittedFollowupLesionOverlapsTheTrueLesion(string format)
    {
        // Truth: the voxelised true follow-up lesion on the follow-up grid; issue 5: Dice ≥ 0.8.
        foreach (var c in Cases(format)) Assert.True(c.FollowupDice >= 0.8, $"{c.Name}: Dice {c.FollowupDice:F3}");
    }

    [Fact]
    public void NoChangePairsStayWithinNoiseAndTrueGrowthAboveTheRcIsFlagged()
    {
        // Truth: growth 1.0 pairs are re-acquisitions with new noise and motion (no change); issue 5: exceedsNoise false
        // for ≥ 95 % of the volume and ADC measures that have a band (published default profile).
        string[] ids = ["lesion.volume", "lesion.volume.ellipsoid", "gland.volume", "gland.volume.ellipsoid", "lesion.adc.mean", "lesion.adc.median", "lesion.adc.p10"];
        var still = fx.All.Where(c => c.Growth == 1.0).SelectMany(c => ids.Select(c.Change)).ToList();
        Assert.True(still.Count >= 20, $"{still.Count} no-change values");
        Assert.All(still, ch => Assert.NotNull(ch.ExceedsNoise));
        Assert.True(still.Count(ch => ch.ExceedsNoise == false) >= 0.95 * still.Count,
            string.Join("; ", still.Where(ch => ch.ExceedsNoise == true).Select(ch => $"{ch.Measure} {ch.RelativeDelta:P1}")));

        // Truth: a true volume ratio beyond the profile's 95 % limit (log scale: exp(1.96·√2·σL)) must be flagged as growth.
        var profile = Engine.Repeatability.RepeatabilityProfile.LoadDefault();
        double limit = Math.Exp(1.96 * Math.Sqrt(2) * profile.Find("lesion.volume")!.SdLog!.Value);
        var grown = fx.All.Where(c => c.TrueVolumeMl[1] / c.TrueVolumeMl[0] > limit * 1.1).ToList();
        Assert.NotEmpty(grown);
        Assert.All(grown, c => Assert.True(c.Change("lesion.volume").ExceedsNoise == true, $"{c.Name}: growth {c.Growth} not flagged"));
    }
}
