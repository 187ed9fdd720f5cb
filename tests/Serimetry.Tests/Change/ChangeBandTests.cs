using Serimetry.Engine.Change;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Change;

/// <summary>95 % change bands against the published repeatability arithmetic (facts.md §1–2).</summary>
public class ChangeBandTests
{
    private static RepeatabilityEntry Log(double wcv) => new("lesion.adc.median", ErrorScale.Log, null, wcv, "1", "test");

    private static RepeatabilityEntry Abs(double wsd) => new("x", ErrorScale.Absolute, wsd, null, "mL", "test");

    [Theory]
    // Src: facts.md §1 (Obuchowski, Acad Radiol 2018): log-scale limits are asymmetric, wCV 17 % → about
    // +60 % / −37 %, wCV 10 % → +32 % / −24 % [derived there]. The QIBA prostate claim wCV = 0.17 is Boss
    // et al., JMRI 2022 (facts.md §2).
    [InlineData(0.17, 1.60, 0.63)]
    [InlineData(0.10, 1.32, 0.76)]
    public void NoChangeBandOnTheLogScaleHasThePublishedPercentLimits(double wcv, double upper, double lower)
    {
        var c = ChangeBands.Compare("lesion.adc.median", "10^-6 mm2/s", 0, 1, 1000, 1000, Log(wcv));
        Assert.Equal(upper, c.RatioCi95![1], 0.006);
        Assert.Equal(lower, c.RatioCi95[0], 0.006);
        Assert.Equal(1000 * (c.RatioCi95[0] - 1), c.Ci95![0], 9);
        Assert.Equal(1000 * (c.RatioCi95[1] - 1), c.Ci95[1], 9);
        Assert.False(c.ExceedsNoise);
        Assert.Equal(ChangeDirection.Stable, c.Direction);
    }

    [Fact]
    public void RepeatabilityCoefficientIs277TimesWsd()
    {
        // Src: Bland, "repeatability" note: RC = 1.96·√2·wSD ≈ 2.77·wSD (facts.md §1).
        Assert.Equal(2.77, ChangeBands.RepeatabilityCoefficient(1), 0.005);
        // Src: facts.md §2: prostate lesion wCV 0.17 gives RC% = 2.77·0.17 ≈ 47 % (linear approximation).
        Assert.Equal(0.47, ChangeBands.RepeatabilityCoefficient(0.17), 0.005);
    }

    [Fact]
    public void AbsoluteBandIsDeltaPlusMinusRc()
    {
        var grow = ChangeBands.Compare("x", "mL", 0, 1, 1.0, 1.2, Abs(0.05));
        double rc = 1.959963984540054 * Math.Sqrt(2) * 0.05;
        Assert.Equal(0.2 - rc, grow.Ci95![0], 12);
        Assert.Equal(0.2 + rc, grow.Ci95[1], 12);
        Assert.Equal(rc, grow.RepeatabilityCoefficient!.Value, 12);
        Assert.True(grow.ExceedsNoise);
        Assert.Equal(ChangeDirection.Increase, grow.Direction);
        Assert.Equal(0.2, grow.RelativeDelta!.Value, 12);

        var small = ChangeBands.Compare("x", "mL", 0, 1, 1.0, 1.1, Abs(0.05));
        Assert.False(small.ExceedsNoise);
        var shrink = ChangeBands.Compare("x", "mL", 0, 2, 1.0, 0.7, Abs(0.05));
        Assert.Equal(ChangeDirection.Decrease, shrink.Direction);
    }

    [Fact]
    public void LogBandFlagsATrueDoublingAndNotNoise()
    {
        // A lesion volume doubling (ratio 2) against wCV 17 %: ratio CI = 2·[0.63, 1.60] excludes 1.
        var c = ChangeBands.Compare("lesion.volume", "mL", 0, 1, 0.5, 1.0, Log(0.17));
        Assert.True(c.ExceedsNoise);
        Assert.Equal(ChangeDirection.Increase, c.Direction);
        Assert.True(c.Ci95![0] > 0);
        Assert.Equal(ErrorScale.Log, c.Scale);
    }

    [Fact]
    public void MissingEntryOrUnsuitableValuesGiveNoBandAndAFlag()
    {
        var none = ChangeBands.Compare("x", "mL", 0, 1, 1, 2, null);
        Assert.Null(none.Ci95);
        Assert.Null(none.ExceedsNoise);
        Assert.Equal(ChangeDirection.Unknown, none.Direction);
        Assert.Contains(none.Flags, f => f.Contains("no repeatability entry"));

        var negative = ChangeBands.Compare("x", "1", 0, 1, -1, 2, Log(0.1));
        Assert.Null(negative.Ci95);
        Assert.Contains(negative.Flags, f => f.Contains("positive"));

        var zero = ChangeBands.Compare("x", "mL", 0, 1, 0, 2, Abs(0.1));
        Assert.Null(zero.RelativeDelta);
    }
}
