using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Xunit;

namespace Serimetry.Tests.Imaging;

public class ResampleGridTests
{
    // Src: IBSI 1 reference manual, "Interpolation" (facts.md §8): n_b = ceil(n_a·s_a/s_b), grid centres aligned.
    [Theory]
    [InlineData(5, 2.0, 1.0, 10)]
    [InlineData(384, 0.5, 1.0, 192)]
    [InlineData(24, 3.6, 1.0, 87)]
    [InlineData(7, 0.9, 2.0, 4)]
    [InlineData(3, 1.0, 3.0, 1)]
    public void SizeFollowsTheIbsiRuleAndCentresAlign(int n, double from, double to, int expected)
    {
        var g = TestGrids.Oblique(new Size3(n, n, n)).With(spacingMm: new Vec3(from, from, from));
        var r = ResampleGrid.WithSpacing(g, new Vec3(to, to, to));
        Assert.Equal(new Size3(expected, expected, expected), r.Size);
        Assert.True((r.CenterMm - g.CenterMm).Norm < 1e-9);
        Assert.Equal(g.Direction, r.Direction);
    }

    [Fact]
    public void RefusesBadSpacing()
    {
        var g = Geometry.Axial(new Size3(4, 4, 4), new Vec3(1, 1, 1), Vec3.Zero);
        Assert.Throws<InvalidParameterException>(() => ResampleGrid.WithSpacing(g, new Vec3(0, 1, 1)));
        Assert.Throws<InputLimitException>(() => ResampleGrid.WithSpacing(g, new Vec3(1e-6, 1, 1)));
    }
}
