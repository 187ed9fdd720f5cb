using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Xunit;

namespace Serimetry.Tests.Compare;

public class LesionRefitTests
{
    private static readonly Geometry Grid = Geometry.Axial(new Size3(80, 80, 20), new Vec3(0.6, 0.6, 3.0), new Vec3(-24, -24, -30));

    private static Volume<byte> Ellipsoid(Vec3 c, Vec3 semi)
    {
        var m = new Volume<byte>(Grid);
        for (int k = 0; k < Grid.Size.Z; k++)
            for (int j = 0; j < Grid.Size.Y; j++)
                for (int i = 0; i < Grid.Size.X; i++)
                {
                    var d = Grid.IndexToPhysical(i, j, k) - c;
                    if (Math.Pow(d.X / semi.X, 2) + Math.Pow(d.Y / semi.Y, 2) + Math.Pow(d.Z / semi.Z, 2) <= 1) m[i, j, k] = 1;
                }
        return m;
    }

    /// <summary>A central zone of intermediate signal that the lesion touches (like a transition zone).</summary>
    private static readonly Volume<byte> InnerZone = Ellipsoid(new Vec3(-6, -2, 0), new Vec3(9, 8, 14));

    /// <summary>
    /// Known truth: T2w and ADC built from the masks (gland, an inner zone with T2 and ADC between gland and
    /// lesion, lesion) with Gaussian noise and a smooth multiplicative T2 bias.
    /// </summary>
    private static (Volume<float> T2, Volume<float> Adc) Images(Volume<byte> gland, Volume<byte> lesion, int seed, double bias)
    {
        var rng = new Random(seed);
        var t2 = new Volume<float>(Grid);
        var adc = new Volume<float>(Grid);
        for (int n = 0; n < t2.Voxels.Length; n++)
        {
            double g1 = Gauss(rng), g2 = Gauss(rng);
            int i = n % Grid.Size.X;
            double b = 1 + bias * (i - 40) / 40.0;
            bool l = lesion.Voxels[n] != 0, g = gland.Voxels[n] != 0, z = InnerZone.Voxels[n] != 0;
            t2.Voxels[n] = (float)(b * ((l ? 550 : z ? 720 : g ? 1000 : 300) + 60 * g1));
            adc.Voxels[n] = (float)((l ? 850 : z ? 1250 : g ? 1550 : 2200) + 120 * g2);
        }
        return (t2, adc);
    }

    private static double Gauss(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());

    [Theory]
    [InlineData(1, 1.0)]
    [InlineData(2, 1.5)]
    [InlineData(3, 2.0)]
    public void RefitFollowsTrueGrowth(int seed, double growth)
    {
        // Truth: the lesion volume is multiplied by `growth`; the propagated outline is the baseline one.
        var gland = Ellipsoid(Vec3.Zero, new Vec3(20, 16, 24));
        var lesion0 = Ellipsoid(new Vec3(5, 3, 0), new Vec3(6, 6, 7));
        double f = Math.Cbrt(growth);
        var lesion1 = Ellipsoid(new Vec3(5, 3, 0), new Vec3(6 * f, 6 * f, 7 * f));
        var (t2a, adca) = Images(gland, lesion0, seed, 0.0);
        var (t2b, adcb) = Images(gland, lesion1, seed + 100, 0.15);
        var settings = new LesionRefitSettings();
        var model = LesionRefit.Learn(t2a, adca, lesion0, gland, settings);
        var result = LesionRefit.Refit(t2b, adcb, lesion0, gland, model, settings);
        Assert.True(result.Refitted, result.Note);
        double dice = MaskOps.Dice(result.Mask, lesion1);
        double ratio = (double)MaskOps.Count(result.Mask) / MaskOps.Count(lesion1);
        Assert.True(dice >= 0.9, $"Dice {dice:F3}");
        Assert.InRange(ratio, 0.93, 1.07);
    }

    [Fact]
    public void KeepsThePropagatedOutlineWhenTheLesionIsInvisible()
    {
        var gland = Ellipsoid(Vec3.Zero, new Vec3(20, 16, 24));
        var lesion = Ellipsoid(new Vec3(5, 3, 0), new Vec3(6, 6, 7));
        var (t2, adc) = Images(gland, gland.Like<byte>(), 7, 0);
        var model = LesionRefit.Learn(t2, adc, lesion, gland, new LesionRefitSettings());
        var result = LesionRefit.Refit(t2, adc, lesion, gland, model, new LesionRefitSettings());
        Assert.False(result.Refitted);
        Assert.Contains("propagated outline kept", result.Note);
    }
}
