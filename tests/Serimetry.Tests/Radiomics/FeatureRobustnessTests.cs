using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Robustness;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>Robustness filtering: ICC(2,1) and Spearman ρ against published and hand-computed values.</summary>
public sealed class FeatureRobustnessTests
{
    // Src: Shrout & Fleiss, Psychol Bull 1979;86:420, Table 2 (6 targets × 4 judges); ICC(2,1) = 0.29 (from memory
    // of the published result, the usual worked example of ICC software documentation).
    private static readonly double[,] ShroutFleiss =
    {
        { 9, 2, 5, 8 }, { 6, 1, 3, 2 }, { 8, 4, 6, 8 }, { 7, 1, 2, 6 }, { 10, 5, 6, 9 }, { 6, 2, 4, 7 },
    };

    [Fact]
    public void Icc21_reproduces_the_Shrout_Fleiss_example() =>
        Assert.Equal(0.29, FeatureRobustness.Icc21(ShroutFleiss), 2);

    [Fact]
    public void Test_retest_keeps_features_that_repeat_and_drops_noisy_ones()
    {
        var values = new List<TestRetestValue>();
        var rng = new Random(7);
        for (int s = 0; s < 12; s++)
        for (int r = 0; r < 2; r++)
        {
            double truth = 10 * s;
            values.Add(new TestRetestValue($"S{s}", r, new FeatureValue("glcm", "Joint maximum", "GYBY", "IAZD", truth + rng.NextDouble())));
            values.Add(new TestRetestValue($"S{s}", r, new FeatureValue("glcm", "Contrast", "ACUI", "IAZD", 100 * rng.NextDouble())));
        }
        var result = FeatureRobustness.TestRetest(values);
        Assert.True(result.Single(f => f.IbsiCode == "GYBY").Robust);
        Assert.False(result.Single(f => f.IbsiCode == "ACUI").Robust);
        Assert.All(result, f => Assert.Equal(12, f.Subjects));
    }

    [Fact]
    public void Spearman_matches_hand_computed_ranks_with_ties()
    {
        // Ranks x: 1, 2.5, 2.5, 4; y: 1, 2, 3, 4 → ρ = Pearson of the ranks = 0.9487 (hand computation: 4.5/√(4.5·5)).
        Assert.Equal(4.5 / Math.Sqrt(4.5 * 5), FeatureRobustness.Spearman([1.0, 5, 5, 9], [10.0, 20, 30, 40]), 12);
        Assert.Equal(-1.0, FeatureRobustness.Spearman([1.0, 2, 3], [3.0, 2, 1]), 12);
    }

    [Fact]
    public void Acquisition_correlations_flag_features_that_track_the_protocol()
    {
        var exams = Enumerable.Range(0, 6).Select(e => new ExamFeatures($"E{e}",
            new Dictionary<string, double> { ["SliceThicknessMm"] = 2 + e * 0.5 },
            [new FeatureValue("morphology", "Volume (mesh)", "RNU0", "DHQ4", 100 + 7 * e),
             new FeatureValue("glcm", "Contrast", "ACUI", "IAZD", e % 2 == 0 ? 1 : 2)])).ToList();
        var c = FeatureRobustness.AcquisitionCorrelations(exams);
        Assert.True(c.Single(x => x.IbsiCode == "RNU0").Strong);
        Assert.False(c.Single(x => x.IbsiCode == "ACUI").Strong);
    }
}
