using Serimetry.Engine.Radiomics;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>
/// Invariances that need no reference values (common practice): features do not depend on the storage
/// order of the axes. Flips keep slices as slices, so every aggregation must be unchanged; swapping x and y
/// keeps slices too; a permutation that moves z changes the slices, so only 3D aggregations are compared.
/// </summary>
public sealed class RadiomicsInvarianceTests
{
    private static IReadOnlyList<FeatureValue> Run(bool fx, bool fy, bool fz, int[] perm)
    {
        var (image, mask) = RadiomicsTestData.Phantom();
        return RadiomicsExtractor.Extract(RadiomicsTestData.Reorient(image, fx, fy, fz, perm),
            RadiomicsTestData.Reorient(mask, fx, fy, fz, perm), RadiomicsTestData.PhantomSettings);
    }

    private static void AssertSame(IReadOnlyList<FeatureValue> a, IReadOnlyList<FeatureValue> b, Func<FeatureValue, bool> include)
    {
        Assert.Equal(a.Count, b.Count);
        int compared = 0;
        for (int n = 0; n < a.Count; n++)
        {
            Assert.Equal(a[n].IbsiCode, b[n].IbsiCode);
            if (!include(a[n])) continue;
            compared++;
            double x = a[n].Value, y = b[n].Value;
            if (double.IsNaN(x)) { Assert.True(double.IsNaN(y), a[n].Feature); continue; }
            Assert.True(Math.Abs(x - y) <= 1e-9 * Math.Max(1, Math.Abs(x)),
                $"{a[n].Family}/{a[n].Feature} [{a[n].AggregationCode}]: {x} vs {y}");
        }
        Assert.True(compared > 100);
    }

    [Theory]
    [InlineData(true, false, false)]
    [InlineData(false, true, false)]
    [InlineData(false, false, true)]
    [InlineData(true, true, true)]
    public void Features_are_unchanged_by_axis_flips(bool fx, bool fy, bool fz) =>
        AssertSame(Run(false, false, false, [0, 1, 2]), Run(fx, fy, fz, [0, 1, 2]), _ => true);

    [Fact]
    public void Features_are_unchanged_by_swapping_in_plane_axes() =>
        AssertSame(Run(false, false, false, [0, 1, 2]), Run(false, false, false, [1, 0, 2]), _ => true);

    [Theory]
    [InlineData(2, 1, 0)]
    [InlineData(1, 2, 0)]
    [InlineData(0, 2, 1)]
    public void Three_dimensional_features_are_unchanged_by_axis_permutations_of_the_isotropic_phantom(int a, int b, int c)
    {
        static bool Is3D(FeatureValue f) => f.AggregationCode is IbsiAggregation.None or IbsiAggregation.ThreeDAveraged
            or IbsiAggregation.ThreeDMerged or IbsiAggregation.ThreeD;
        AssertSame(Run(false, false, false, [0, 1, 2]), Run(false, false, false, [a, b, c]), Is3D);
    }
}
