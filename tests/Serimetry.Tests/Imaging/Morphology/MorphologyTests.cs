using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Xunit;

namespace Serimetry.Tests.Imaging.Morphology;

public class MorphologyTests
{
    private static Volume<byte> RandomMask(int seed, Size3 size, Vec3 spacing, double fill)
    {
        var rng = new Random(seed);
        var m = new Volume<byte>(Geometry.Axial(size, spacing, Vec3.Zero));
        for (int n = 0; n < m.Voxels.Length; n++) m.Voxels[n] = rng.NextDouble() < fill ? (byte)1 : (byte)0;
        return m;
    }

    [Theory]
    [InlineData(1, 0.02)]
    [InlineData(2, 0.002)]
    [InlineData(3, 0.3)]
    public void DistanceTransformEqualsBruteForceOnAnisotropicGrid(int seed, double fill)
    {
        // Truth: brute-force minimum over all mask voxels of the spacing-weighted Euclidean distance.
        var m = RandomMask(seed, new Size3(9, 7, 5), new Vec3(0.6, 0.7, 3.0), fill);
        var d2 = DistanceTransform.SquaredDistanceToMaskMm2(m);
        var s = m.Size;
        var sp = m.Geometry.SpacingMm;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    double best = double.PositiveInfinity;
                    for (int c = 0; c < s.Z; c++)
                        for (int b = 0; b < s.Y; b++)
                            for (int a = 0; a < s.X; a++)
                            {
                                if (m[a, b, c] == 0) continue;
                                double dx = (a - i) * sp.X, dy = (b - j) * sp.Y, dz = (c - k) * sp.Z;
                                best = Math.Min(best, dx * dx + dy * dy + dz * dz);
                            }
                    if (double.IsPositiveInfinity(best)) continue;
                    Assert.Equal(best, d2[m.LinearIndex(i, j, k)], 1e-3);
                }
    }

    [Fact]
    public void DilatingOneVoxelGivesTheDiscreteBall()
    {
        var m = new Volume<byte>(Geometry.Axial(new Size3(31, 31, 11), new Vec3(0.5, 0.5, 2), Vec3.Zero));
        m[15, 15, 5] = 1;
        var d = MaskOps.Dilate(m, 3.0);
        long expected = 0;
        for (int k = -5; k <= 5; k++)
            for (int j = -15; j <= 15; j++)
                for (int i = -15; i <= 15; i++)
                    if (Math.Pow(i * 0.5, 2) + Math.Pow(j * 0.5, 2) + Math.Pow(k * 2.0, 2) <= 9.0 + 1e-4) expected++;
        Assert.Equal(expected, MaskOps.Count(d));
        var back = MaskOps.Erode(d, 3.0);
        Assert.Equal(1, MaskOps.Count(back));
    }

    [Fact]
    public void BoxDilationGrowsEachAxisByWholeVoxelsWithinTheMargin()
    {
        // Src: definition — a box of ±3 mm holds ±6 voxels at 0.5 mm and ±1 voxel at 2 mm (floor of margin/spacing);
        // it contains the Euclidean ball of the same radius.
        var m = new Volume<byte>(Geometry.Axial(new Size3(31, 31, 11), new Vec3(0.5, 0.5, 2), Vec3.Zero));
        m[15, 15, 5] = 1;
        m[2, 30, 0] = 1; // clipped at the grid border: rows 0..8, columns 24..30, slices 0..1
        var box = MaskOps.DilateBox(m, 3.0);
        Assert.Equal(13 * 13 * 3 + 9 * 7 * 2, MaskOps.Count(box));
        Assert.Equal(MaskOps.Count(MaskOps.Dilate(m, 3.0)), MaskOps.Count(MaskOps.And(box, MaskOps.Dilate(m, 3.0))));
    }

    [Fact]
    public void ComponentsTouchingKeepsOnlySeededComponentsAndFillHolesClosesCavities()
    {
        var m = new Volume<byte>(Geometry.Axial(new Size3(12, 12, 12), new Vec3(1, 1, 1), Vec3.Zero));
        for (int k = 1; k < 6; k++) for (int j = 1; j < 6; j++) for (int i = 1; i < 6; i++) m[i, j, k] = 1;
        m[3, 3, 3] = 0; // a cavity
        m[9, 9, 9] = 1; // a separate component
        var seed = m.Like<byte>();
        seed[1, 1, 1] = 1;
        var kept = MaskOps.ComponentsTouching(m, seed);
        Assert.Equal(124, MaskOps.Count(kept));
        Assert.Equal(125, MaskOps.Count(MaskOps.FillHoles(kept)));
        Assert.Equal(2 * 124.0 / (124 + 125), MaskOps.Dice(kept, MaskOps.FillHoles(kept)), 12);
    }
}
