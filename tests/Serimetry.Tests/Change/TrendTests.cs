using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Change;

/// <summary>OLS trends, doubling times and PSA kinetics against certified and published worked examples.</summary>
public class TrendTests
{
    // Src: NIST StRD linear regression dataset "Norris" (itl.nist.gov/div898/strd/lls/data/Norris.dat),
    // 36 observations; the data and certified values agree across several independent public test suites.
    private static readonly double[] NorrisY =
    [
        0.1, 338.8, 118.1, 888.0, 9.2, 228.1, 668.5, 998.5, 449.1, 778.9, 559.2, 0.3, 0.1, 778.1, 668.8, 339.3, 448.9, 10.8,
        557.7, 228.3, 998.0, 888.8, 119.6, 0.3, 0.6, 557.6, 339.3, 888.0, 998.5, 778.9, 10.2, 117.6, 228.9, 668.4, 449.2, 0.2,
    ];

    private static readonly double[] NorrisX =
    [
        0.2, 337.4, 118.2, 884.6, 10.1, 226.5, 666.3, 996.3, 448.6, 777.0, 558.2, 0.4, 0.6, 775.5, 666.9, 338.0, 447.5, 11.6,
        556.0, 228.1, 995.8, 887.6, 120.2, 0.3, 0.3, 556.8, 339.1, 887.2, 999.0, 779.0, 11.1, 118.3, 229.2, 669.1, 448.9, 0.5,
    ];

    [Fact]
    public void OlsMatchesNistNorrisCertifiedValues()
    {
        // Src: NIST StRD Norris certified values: B1 = 1.00211681802045 (SE 0.429796848199937E-03),
        // B0 = −0.262323073774029.
        var fit = LinearFit.Fit(NorrisX, NorrisY);
        Assert.Equal(1.00211681802045, fit.Slope, 1e-12);
        Assert.Equal(0.429796848199937E-03, fit.SlopeSe, 1e-14);
        Assert.Equal(-0.262323073774029, fit.Intercept, 1e-10);
        Assert.Equal(34, fit.DegreesOfFreedom);
        // Src: Student t table, t(0.975, 34) = 2.032 (from memory of the standard table).
        Assert.Equal(2.032, LinearFit.TQuantile975(34), 0.0005);
        Assert.Equal(fit.Slope - LinearFit.TQuantile975(34) * fit.SlopeSe, fit.SlopeCiLow, 1e-12);
    }

    [Fact]
    public void TQuantilesMatchTheTable()
    {
        // Src: Student t table (common practice): t(0.975; 1) = 12.706, (2) = 4.303, (10) = 2.228.
        Assert.Equal(12.706, LinearFit.TQuantile975(1), 0.001);
        Assert.Equal(4.303, LinearFit.TQuantile975(2), 0.001);
        Assert.Equal(2.228, LinearFit.TQuantile975(10), 0.001);
    }

    [Fact]
    public void TwoPointPsaDoublingTimeWorkedExample()
    {
        // Src: "PSA Doubling Time (PSADT) – Part 3. DIY formulas" (Palpable Prostate notes, cited in facts.md §6):
        // PSA rising from 4 to 5 ng/mL over 16 months gives PSADT = 16/(log2 5 − log2 4) = 49.7 months.
        var (k, _, _) = GrowthTimes.TwoPointRate(4, 0, 5, 16, null);
        Assert.Equal(49.7, GrowthTimes.DoublingTime(k)!.Value, 0.05);
    }

    [Fact]
    public void SchwartzVolumeDoublingTimeWorkedExample()
    {
        // Src: Schwartz 1961 formula DT = Δt·ln2/ln(V2/V1) (Mehrara et al., Cancer Res 2007); worked example of a
        // nodule growing from 200 to 450 mm³ in 30 days: SGR 0.027/day, DT ≈ 25.6 days (tumour growth-rate
        // calculator page, costcalculator.calculator.city).
        var (k, _, _) = GrowthTimes.TwoPointRate(200, 0, 450, 30, null);
        Assert.Equal(0.027, k, 0.0005);
        Assert.Equal(25.6, GrowthTimes.DoublingTime(k)!.Value, 0.05);
    }

    [Fact]
    public void TwoPointRateCiFromLogRepeatability()
    {
        // Src: facts.md §7 [derived from §1]: CI(k) = [ln(V2/V1) ± 1.96·√2·σL]/Δt; if it spans 0 the DT is unbounded.
        double sigma = ChangeBands.LogSd(0.17);
        var (k, lo, hi) = GrowthTimes.TwoPointRate(1.0, 0, 1.3, 1, sigma);
        Assert.Equal(Math.Log(1.3), k, 12);
        Assert.Equal(Math.Log(1.3) - 1.959963984540054 * Math.Sqrt(2) * sigma, lo, 12);
        var ci = GrowthTimes.TimeCi(k, lo, hi)!;
        Assert.True(lo < 0 && hi > 0);
        Assert.Null(ci[1]);
        Assert.Equal(Math.Log(2) / hi, ci[0]!.Value, 12);
    }

    [Fact]
    public void ExactExponentialGivesExactDoublingTime()
    {
        // Src: analytic: V(t) = V0·2^(t/DT) with DT = 1.5 yr sampled at four dates.
        var d0 = new DateOnly(2020, 1, 1);
        var pts = new[] { 0, 400, 800, 1500 }.Select(days => new DatedValue(d0.AddDays(days), 0.4 * Math.Pow(2, days / 365.25 / 1.5))).ToList();
        var t = TrendFitter.Fit("lesion.volume", "mL", TrendScale.Log, pts)!;
        Assert.Equal("ols", t.Method);
        Assert.Equal(1.5, t.DoublingTimeYears!.Value, 9);
        Assert.Equal(1.5, t.TimeCi95Years![0]!.Value, 6);
        Assert.Equal(1.5, t.TimeCi95Years[1]!.Value, 6);
        Assert.Null(t.HalvingTimeYears);
        Assert.Equal(4, t.NVisits);
    }

    [Fact]
    public void ShrinkingSeriesGivesAHalvingTimeAndNoisySeriesAnUnboundedOne()
    {
        var d0 = new DateOnly(2020, 1, 1);
        var shrink = new[] { 0, 365, 730 }.Select(d => new DatedValue(d0.AddDays(d), Math.Pow(0.5, d / 365.25))).ToList();
        var t = TrendFitter.Fit("lesion.volume", "mL", TrendScale.Log, shrink)!;
        Assert.Null(t.DoublingTimeYears);
        Assert.Equal(1.0, t.HalvingTimeYears!.Value, 9);

        var noisy = new[] { (0, 1.0), (365, 1.2), (730, 0.95), (1095, 1.25) }.Select(p => new DatedValue(d0.AddDays(p.Item1), p.Item2)).ToList();
        var n = TrendFitter.Fit("lesion.volume", "mL", TrendScale.Log, noisy)!;
        Assert.True(n.Ci95![0] < 0 && n.Ci95[1] > 0);
        Assert.Null(n.TimeCi95Years![1]);
        Assert.Contains(n.Flags, f => f.Contains("unbounded"));
    }

    [Fact]
    public void PsaVelocityIsTheLinearSlopePerYear()
    {
        // Src: PSAV = slope of the linear regression of PSA on time (Carter et al., Urology 1995; facts.md §6).
        // Exact line: +0.5 ng/mL per 365.25 days.
        var d0 = new DateOnly(2021, 2, 1);
        var psa = new[] { 0, 200, 500, 900 }.Select(d => new PsaSample(d0.AddDays(d), 4 + 0.5 * d / 365.25)).ToList();
        var trends = PsaKinetics.Trends(psa);
        var v = trends.Single(t => t.Measure == PsaKinetics.VelocityId);
        Assert.Equal(0.5, v.SlopePerYear, 9);
        Assert.Equal("ng/mL/yr", v.SlopeUnit);
        Assert.NotNull(trends.Single(t => t.Measure == PsaKinetics.DoublingId).DoublingTimeYears);
    }

    [Fact]
    public void PsaOutOfOrderOrNonPositiveIsAClearError()
    {
        var bad = new List<PsaSample> { new(new DateOnly(2022, 5, 1), 5), new(new DateOnly(2021, 5, 1), 6) };
        var ex = Assert.Throws<InvalidParameterException>(() => PsaKinetics.Trends(bad));
        Assert.Contains("out of order", ex.Message);
        Assert.Contains("2021-05-01", ex.Message);
        Assert.Equal("--psa", ex.Where);
        Assert.Throws<InvalidParameterException>(() => PsaKinetics.Validate([new(new DateOnly(2022, 5, 1), 0)]));
        Assert.Throws<InvalidParameterException>(() => PsaKinetics.Validate([new(new DateOnly(2022, 5, 1), double.NaN)]));
    }

    [Fact]
    public void TwoVisitTrendUsesTheRepeatabilityEntryForItsCi()
    {
        var entry = new RepeatabilityEntry("lesion.volume", ErrorScale.Log, null, 0.1, "1", "test");
        var pts = new List<DatedValue> { new(new DateOnly(2020, 1, 1), 1), new(new DateOnly(2022, 1, 1), 2) };
        var t = TrendFitter.Fit("lesion.volume", "mL", TrendScale.Log, pts, entry)!;
        Assert.Equal("two-point", t.Method);
        Assert.NotNull(t.Ci95);
        var noEntry = TrendFitter.Fit("lesion.volume", "mL", TrendScale.Log, pts)!;
        Assert.Null(noEntry.Ci95);
        Assert.Contains(noEntry.Flags, f => f.Contains("no CI"));
    }

    [Fact]
    public void PsaValueNearAVisit()
    {
        var psa = new List<PsaSample> { new(new DateOnly(2022, 1, 1), 5), new(new DateOnly(2022, 3, 1), 6) };
        Assert.Equal(6, PsaKinetics.ValueNear(psa, new DateOnly(2022, 2, 20)));
        Assert.Null(PsaKinetics.ValueNear(psa, new DateOnly(2023, 1, 1)));
    }
}
