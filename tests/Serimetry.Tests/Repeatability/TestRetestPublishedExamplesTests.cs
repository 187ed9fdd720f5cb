using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Repeatability;

public sealed class TestRetestPublishedExamplesTests
{
    // Shrout & Fleiss (1979), Psychol Bull 86:420, Table 1: 6 targets rated by 4 judges.
    // Src for data and results: R package psych, tests/testthat/test_ICC.R ("does it match the numbers from
    // Shrout and Fleiss"), rdrr.io/cran/psych/src/tests/testthat/test_ICC.R.
    private static readonly double[,] ShroutFleiss =
    {
        { 9, 2, 5, 8 }, { 6, 1, 3, 2 }, { 8, 4, 6, 8 }, { 7, 1, 2, 6 }, { 10, 5, 6, 9 }, { 6, 2, 4, 7 },
    };

    // Bland & Altman (1986), Lancet 327:307: PEFR (l/min) of 17 subjects, first Wright and first mini-Wright
    // reading. Src for data: www-users.york.ac.uk/~mb55/meas/repeated.htm (Bland's table).
    private static readonly double[] WrightFirst = [494, 395, 516, 434, 476, 557, 413, 442, 650, 433, 417, 656, 267, 478, 178, 423, 427];
    private static readonly double[] MiniFirst = [512, 430, 520, 428, 500, 600, 364, 380, 658, 445, 432, 626, 260, 477, 259, 350, 451];

    private static List<RepeatabilityObservation> Tidy(double[,] x, string measure = "m")
    {
        var rows = new List<RepeatabilityObservation>();
        for (int i = 0; i < x.GetLength(0); i++)
            for (int j = 0; j < x.GetLength(1); j++)
                rows.Add(new RepeatabilityObservation($"S{i + 1}", measure, $"J{j + 1}", x[i, j]));
        return rows;
    }

    [Fact]
    public void ShroutFleissIccsMatchPublishedValues()
    {
        var m = TestRetestAnalysis.Analyse(Tidy(ShroutFleiss)).Measures.Single();
        // Src: Shrout & Fleiss 1979 Table 2 via psych test_ICC.R: .17 .29 .71 .44 .62 .91 (two decimals).
        Assert.Equal(0.17, Math.Round(m.Icc.Icc11.Value!.Value, 2));
        Assert.Equal(0.29, Math.Round(m.Icc.Icc21.Value!.Value, 2));
        Assert.Equal(0.71, Math.Round(m.Icc.Icc31.Value!.Value, 2));
        Assert.Equal(0.44, Math.Round(m.Icc.Icc1k.Value!.Value, 2));
        Assert.Equal(0.62, Math.Round(m.Icc.Icc2k.Value!.Value, 2));
        Assert.Equal(0.91, Math.Round(m.Icc.Icc3k.Value!.Value, 2));
        Assert.Equal(6, m.NSubjects);
        Assert.Equal(4, m.NRepeats);
    }

    [Fact]
    public void ShroutFleissWithinMeanSquareGivesWsd()
    {
        // Shrout & Fleiss 1979 Table 2 one-way within-target mean square WMS = 6.26 (from memory; it reproduces
        // the psych-confirmed ICC(1,1) = (11.24 - 6.26) / (11.24 + 3 * 6.26) = .17).
        var m = TestRetestAnalysis.Analyse(Tidy(ShroutFleiss)).Measures.Single();
        Assert.Equal(6.26, m.WithinSubjectSd * m.WithinSubjectSd, 2);
        Assert.Equal(TestRetestAnalysis.RcFactor * m.WithinSubjectSd, m.Rc, 12);
        Assert.Equal(2.77, TestRetestAnalysis.RcFactor, 2); // Src: facts.md §1, RC = 1.96·√2·wSD ≈ 2.77·wSD.
    }

    [Fact]
    public void IccConfidenceIntervalsBracketEstimatesAndMatchRecalledValues()
    {
        var m = TestRetestAnalysis.Analyse(Tidy(ShroutFleiss)).Measures.Single();
        foreach (var e in new[] { m.Icc.Icc11, m.Icc.Icc21, m.Icc.Icc31, m.Icc.Icc1k, m.Icc.Icc2k, m.Icc.Icc3k })
        {
            Assert.True(e.CiLow < e.Value && e.Value < e.CiHigh, $"{e}");
        }
        // psych::ICC(sf) printed bounds, from memory: ICC3 [.34, .95], ICC3k [.68, .99], ICC1 [-.13, .72].
        Assert.Equal(0.34, m.Icc.Icc31.CiLow!.Value, 0.006);
        Assert.Equal(0.95, m.Icc.Icc31.CiHigh!.Value, 0.006);
        Assert.Equal(0.68, m.Icc.Icc3k.CiLow!.Value, 0.006);
        Assert.Equal(0.99, m.Icc.Icc3k.CiHigh!.Value, 0.006);
        Assert.Equal(-0.13, m.Icc.Icc11.CiLow!.Value, 0.006);
        Assert.Equal(0.72, m.Icc.Icc11.CiHigh!.Value, 0.006);
        // ICC2 [.02, .76] and ICC2k [.07, .93] (Satterthwaite bounds), from memory of the same printout.
        Assert.Equal(0.02, m.Icc.Icc21.CiLow!.Value, 0.006);
        Assert.Equal(0.76, m.Icc.Icc21.CiHigh!.Value, 0.006);
        Assert.Equal(0.07, m.Icc.Icc2k.CiLow!.Value, 0.006);
        Assert.Equal(0.93, m.Icc.Icc2k.CiHigh!.Value, 0.006);
    }

    [Fact]
    public void BlandAltmanPefrMatchesPublishedLimits()
    {
        var rows = new List<RepeatabilityObservation>();
        for (int i = 0; i < WrightFirst.Length; i++)
        {
            rows.Add(new($"P{i + 1}", "pefr", "wright", WrightFirst[i]));
            rows.Add(new($"P{i + 1}", "pefr", "mini", MiniFirst[i]));
        }
        var ba = TestRetestAnalysis.Analyse(rows).Measures.Single().BlandAltman!;
        // Src: Bland & Altman 1986 (mean difference 2.1 l/min mini minus Wright, SD 38.8 l/min); with 1.96·SD the
        // limits are -73.9 to 78.1 (analyse-it.com/docs/tutorials/blandaltman/estimatingloa, same data).
        Assert.Equal("wright", ba.FirstRepeat);
        Assert.Equal(2.1, ba.Bias.Value!.Value, 1);
        Assert.Equal(38.8, ba.SdDifferences, 1);
        Assert.Equal(-73.9, ba.LoaLow.Value!.Value, 1);
        Assert.Equal(78.1, ba.LoaHigh.Value!.Value, 1);
        Assert.Equal(17, ba.NPairs);
        Assert.True(ba.Bias.CiLow < 2.1 && ba.Bias.CiHigh > 2.1);
        // CI half-width of a limit = t(0.975,16)·SD·√(3/17) (Bland & Altman 1986 approximation) = 34.5 l/min [derived].
        Assert.Equal(34.5, ba.LoaHigh.CiHigh!.Value - ba.LoaHigh.Value!.Value, 1);
    }

    [Fact]
    public void PerChildSdsMatchBlandAltmanMeasurementErrorTable()
    {
        // Bland & Altman, "Measurement error", BMJ 1996;313:744, Table 1: four PEFR readings (l/min) of 20
        // schoolchildren with each child's mean and SD; the 16 rows retrieved here (scribd copy of the note).
        double[][] pefr =
        [
            [190, 220, 200, 200], [220, 200, 240, 230], [260, 260, 240, 280], [210, 300, 280, 265],
            [270, 265, 280, 270], [280, 280, 270, 275], [260, 280, 280, 300], [275, 275, 275, 305],
            [280, 290, 300, 290], [320, 290, 300, 290], [300, 300, 310, 300], [270, 250, 330, 370],
            [320, 330, 330, 330], [335, 320, 335, 375], [350, 320, 340, 365], [360, 320, 350, 345],
        ];
        double[] mean = [202.50, 222.50, 260.00, 263.75, 271.25, 276.25, 280.00, 282.50, 290.00, 300.00, 302.50, 305.00, 327.50, 341.25, 343.75, 343.75];
        double[] sd = [12.58, 17.08, 16.33, 38.60, 6.29, 4.79, 16.33, 15.00, 8.16, 14.14, 5.00, 55.08, 5.00, 23.58, 18.87, 17.02];
        var all = new List<RepeatabilityObservation>();
        for (int c = 0; c < pefr.Length; c++)
        {
            var rows = pefr[c].Select((v, j) => new RepeatabilityObservation($"C{c + 1}", "pefr", $"{j + 1}", v)).ToList();
            all.AddRange(rows);
            var m = TestRetestAnalysis.AnalyseMeasure("pefr", rows);
            Assert.Equal(mean[c], m.Mean, 0.005);
            Assert.Equal(sd[c], m.WithinSubjectSd, 0.005);
        }
        // Pooled over the 16 children wSD = √(mean of the published variances) (equal group sizes) [derived].
        double pooled = Math.Sqrt(sd.Average(s => s * s));
        Assert.Equal(pooled, TestRetestAnalysis.Analyse(all).Measures[0].WithinSubjectSd, 0.01);
    }
}
