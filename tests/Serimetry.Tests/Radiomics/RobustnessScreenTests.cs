using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Robustness;
using Serimetry.Engine.Radiomics.Series;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>
/// Robustness filtering as compare applies it: ICC(2,1) ≥ 0.75 (Koo &amp; Li, J Chiropr Med 2016) from a test-retest
/// feature table, and the acquisition-correlation screen across visits (Spearman ρ; exact null: a perfect rank
/// order of n visits arises by chance with probability 2/n!).
/// </summary>
public sealed class RobustnessScreenTests
{
    private static readonly FeatureValue Stable = new("morphology", "Volume (voxel counting)", "YEKZ", "", 0);
    private static readonly FeatureValue Noisy = new("glcm", "Contrast", "ACUI", "IAZD", 0);
    private static readonly FeatureValue Absent = new("glcm", "Joint maximum", "GYBY", "IAZD", 0);

    /// <summary>Three subjects × two repeats: the stable feature differs between subjects, the noisy one only between repeats.</summary>
    private static string Table() =>
        TestRetestTable.Header + "\n"
        + string.Concat(Enumerable.Range(0, 3).SelectMany(s => new[] { 0, 1 }.Select(r =>
            $"S{s},r{r + 1},lesion,t2w,morphology,Volume (voxel counting),YEKZ,,{100 * (s + 1) + r}\n"
            + $"S{s},r{r + 1},lesion,t2w,glcm,Contrast,ACUI,IAZD,{(r + s) % 2}\n")));

    private static VisitFeatures Visit(int k, double slice) => new(k.ToString(System.Globalization.CultureInfo.InvariantCulture),
        new DateOnly(2020 + k, 1, 1), "lesion",
        [Stable with { Value = 1000 + 10 * k * slice }, Noisy with { Value = (k * 7) % 3 }, Absent with { Value = k }], "t2w");

    [Fact]
    public void Test_retest_table_round_trips_and_gives_ICCs()
    {
        var values = TestRetestTable.Read(new StringReader(Table()), "retest.csv");
        Assert.Equal(12, values.Count);
        var w = new StringWriter();
        TestRetestTable.Write(w, values);
        Assert.Equal(Table(), w.ToString());
        var reference = RobustnessReference.FromTestRetest(values, "retest.csv");
        Assert.Equal((3, 2), (reference.Subjects, reference.Repeats));
        Assert.True(reference.Reliabilities.Single(r => r.IbsiCode == "YEKZ").Icc > 0.99);
        Assert.True(reference.Reliabilities.Single(r => r.IbsiCode == "ACUI").Icc < 0);   // no between-subject variance
    }

    [Fact]
    public void Tables_that_cannot_give_an_ICC_are_refused_with_the_fix()
    {
        var one = TestRetestTable.Read(new StringReader(TestRetestTable.Header + "\nS0,r1,,,glcm,Contrast,ACUI,IAZD,1\nS0,r2,,,glcm,Contrast,ACUI,IAZD,2\n"), "one.csv");
        var e = Assert.Throws<InputFormatException>(() => RobustnessReference.FromTestRetest(one, "one.csv"));
        Assert.Contains("combine", e.Fix ?? e.Message);
        Assert.Throws<InputFormatException>(() => TestRetestTable.Read(new StringReader("subject,repeat,value\nS0,r1,1\n"), "short.csv"));
        var bad = Assert.Throws<InputFormatException>(() => TestRetestTable.Read(new StringReader(TestRetestTable.Header + "\nS0,r1,,,glcm,Contrast,ACUI,IAZD,abc\n"), "bad.csv"));
        Assert.Contains("line 2", bad.Message + bad.Where);
    }

    [Fact]
    public void Screen_keeps_robust_features_and_says_why_the_others_go()
    {
        var reference = RobustnessReference.FromTestRetest(TestRetestTable.Read(new StringReader(Table()), "retest.csv"), "retest.csv");
        var visits = Enumerable.Range(0, 2).Select(k => Visit(k, 1)).ToList();
        var screen = RobustnessScreening.Screen(visits, _ => new Dictionary<string, double> { ["SliceSpacingMm"] = 3 }, reference);
        Assert.True(screen.Filtered);
        var d = screen.Decisions.ToDictionary(x => x.IbsiCode);
        Assert.True(d["YEKZ"].Kept);
        Assert.False(d["ACUI"].Kept);
        Assert.StartsWith("ICC -", d["ACUI"].Reason);
        Assert.Equal("not in the test-retest table", d["GYBY"].Reason);
        Assert.True(screen.IsRobust(visits[0], visits[0].Features[0]));
        Assert.False(screen.IsRobust(visits[0], visits[0].Features[1]));
        var deltas = RadiomicsTimeSeries.Deltas(visits[0], visits[1], screen.Kept("lesion", "t2w"));
        Assert.Equal("YEKZ", Assert.Single(deltas).IbsiCode);
        Assert.Contains("acquisition screen not possible with 2 visits", screen.Summary);
    }

    [Fact]
    public void Without_a_table_features_are_unfiltered_and_the_summary_says_so()
    {
        var visits = Enumerable.Range(0, 2).Select(k => Visit(k, 1)).ToList();
        var screen = RobustnessScreening.Screen(visits, _ => new Dictionary<string, double>(), null);
        Assert.False(screen.Filtered);
        Assert.StartsWith("unfiltered", screen.Summary);
        Assert.All(screen.Decisions, x => Assert.True(x.Kept));
        Assert.Null(screen.IsRobust(visits[0], visits[0].Features[0]));
        Assert.Equal(3, RadiomicsTimeSeries.Deltas(visits[0], visits[1], screen.Kept("lesion", "t2w")).Count);
    }

    [Fact]
    public void Features_that_track_an_acquisition_parameter_over_enough_visits_are_dropped()
    {
        // The stable feature rises with the slice spacing over 5 visits (ρ = 1); the others do not track it.
        double[] spacing = [3, 3.5, 4, 4.5, 5];
        var visits = Enumerable.Range(0, 5).Select(k => Visit(k, spacing[k]) with { Features = [Stable with { Value = 100 * spacing[k] }, Absent with { Value = (k * 2) % 5 }] }).ToList();
        var screen = RobustnessScreening.Screen(visits, v => new Dictionary<string, double> { ["SliceSpacingMm"] = spacing[int.Parse(v.VisitId, System.Globalization.CultureInfo.InvariantCulture)] }, null);
        var stable = screen.Decisions.Single(x => x.IbsiCode == "YEKZ");
        Assert.False(stable.Kept);
        Assert.Contains("tracks SliceSpacingMm", stable.Reason);
        Assert.True(screen.Decisions.Single(x => x.IbsiCode == "GYBY").Kept);   // values 0,2,4,1,3: ρ = 1 − 6·10/(5·24) = 0.5
        Assert.Equal(1.0, screen.Correlations.Single(c => c.Correlation.IbsiCode == "YEKZ").Correlation.SpearmanRho, 12);
        Assert.False(screen.IsRobust(visits[0], visits[0].Features[0]));

        // With 4 visits the same correlation is reported but does not drop the feature.
        var four = RobustnessScreening.Screen(visits.Take(4).ToList(), v => new Dictionary<string, double> { ["SliceSpacingMm"] = spacing[int.Parse(v.VisitId, System.Globalization.CultureInfo.InvariantCulture)] }, null);
        Assert.True(four.Decisions.Single(x => x.IbsiCode == "YEKZ").Kept);
        Assert.False(four.Correlations.Single(c => c.Correlation.IbsiCode == "YEKZ").UsedForScreening);
    }
}
