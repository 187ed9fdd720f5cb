using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Xunit;

namespace Serimetry.Tests.Change;

/// <summary>Comparability findings and their documented thresholds (docs/change.md; common practice).</summary>
public class ComparabilityTests
{
    private static VisitAcquisition Visit(int i, double tesla = 3, string vendor = "Acme", double slice = 3, double[]? b = null,
        AdcSource src = AdcSource.Scanner, double te = 100) =>
        new(i, new AcquisitionInfo(tesla, vendor, "M1", 4000, te, slice), new AcquisitionInfo(tesla, vendor, "M1", 4000, 80, slice),
            b ?? [50, 800], new Vec3(0.5, 0.5, slice), new Vec3(2, 2, slice), src);

    [Fact]
    public void IdenticalAcquisitionsGiveNoFindings() => Assert.Empty(ComparabilityChecker.Check([Visit(0), Visit(1), Visit(2)]));

    [Fact]
    public void FieldStrengthVendorBValuesAndSourceAreFlaggedWithSeverity()
    {
        var items = ComparabilityChecker.Check([Visit(0), Visit(1, tesla: 1.5, vendor: "Other", b: [0, 1000], src: AdcSource.Computed)]);
        Assert.Contains(items, i => i.Item == "t2w.fieldStrength" && i.Severity == Severity.Critical && i.Baseline == "3 T" && i.Followup == "1.5 T");
        Assert.Contains(items, i => i.Item == "dwi.manufacturer" && i.Severity == Severity.Warning);
        Assert.Contains(items, i => i.Item == "adc.bValues" && i.Severity == Severity.Warning && i.Baseline == "50,800");
        Assert.Contains(items, i => i.Item == "adc.source" && i.Severity == Severity.Warning);
        Assert.All(items, i => Assert.Equal((0, 1), (i.FromVisit, i.ToVisit)));
    }

    [Theory]
    [InlineData(3.1, null)] // 3 %: below the 5 % info threshold
    [InlineData(3.3, Severity.Info)] // 10 %
    [InlineData(4.0, Severity.Warning)] // 33 %
    [InlineData(5.0, Severity.Critical)] // 67 %
    public void SliceThicknessThresholds(double followup, Severity? expected)
    {
        var items = ComparabilityChecker.Pair(Visit(0), Visit(1, slice: followup));
        var s = items.FirstOrDefault(i => i.Item == "t2w.sliceThickness");
        Assert.Equal(expected, s?.Severity);
    }

    [Fact]
    public void EchoTimeIsAtMostAWarningAndPreviousVisitPairsAreChecked()
    {
        var items = ComparabilityChecker.Check([Visit(0), Visit(1), Visit(2, te: 200)]);
        var te = items.Where(i => i.Item == "t2w.echoTime").ToList();
        Assert.Equal(2, te.Count); // vs baseline and vs the previous visit
        Assert.All(te, i => Assert.Equal(Severity.Warning, i.Severity));
    }

    [Fact]
    public void AcquisitionFactsComeFromSeriesSummaries()
    {
        var t2 = new SeriesSummary("1.2.3", SeriesRole.T2w, new Size3(384, 384, 24), new Vec3(0.5, 0.5, 3), Vec3.Zero, Mat3.Identity, [],
            new AcquisitionInfo(3, "Acme"), "t2", []);
        var dwi = new SeriesSummary("1.2.4", SeriesRole.Dwi, new Size3(128, 128, 24), new Vec3(2, 2, 3), Vec3.Zero, Mat3.Identity, [800, 50],
            new AcquisitionInfo(3, "Acme"), "dwi", []);
        var adc = dwi with { SeriesInstanceUid = "1.2.5", Role = SeriesRole.Adc, BValues = [] };
        var v = VisitAcquisition.FromSeries(1, t2, adc, dwi, AdcSource.Computed);
        Assert.Equal([50.0, 800.0], v.BValues);
        Assert.Equal(new Vec3(2, 2, 3), v.AdcSpacingMm);
        Assert.Equal(3, v.T2w!.FieldStrengthT);
    }
}
