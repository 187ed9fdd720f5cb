using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Xunit;

namespace Serimetry.Tests.Imaging;

public class ResamplerTests
{
    private static readonly Size3 Small = new(17, 13, 7);

    /// <summary>An ISpatialTransform that is not an AffineTransform, forcing the per-voxel path.</summary>
    private sealed class OpaqueTransform(AffineTransform inner) : ISpatialTransform
    {
        public Vec3 TransformPoint(Vec3 fixedPointMm) => inner.TransformPoint(fixedPointMm);
    }

    // Src: common practice (ITK/SimpleITK resampling property: identity onto the same grid returns the input).
    [Theory]
    [InlineData(Interpolation.Nearest)]
    [InlineData(Interpolation.Linear)]
    public void IdentityOntoSameGridReturnsInputExactly(Interpolation mode)
    {
        var g = TestGrids.Oblique(Small);
        var input = TestGrids.Random(g, 1);
        var output = Resampler.Resample(input, g, null, mode, -1f);
        Assert.Equal(input.Voxels, output.Voxels);
    }

    // Src: Thévenaz, Blu & Unser 2000 (B-spline interpolation with prefilter passes through the samples).
    [Fact]
    public void CubicBSplineIdentityReturnsInputAfterPrefilter()
    {
        var g = TestGrids.Oblique(Small);
        var input = TestGrids.Random(g, 2);
        var output = Resampler.Resample(input, g, AffineTransform.Identity, Interpolation.CubicBSpline, -1f);
        for (int i = 0; i < input.Voxels.Length; i++)
            Assert.True(Math.Abs(output.Voxels[i] - input.Voxels[i]) <= 1e-5 * 1000, $"voxel {i}: {output.Voxels[i]} vs {input.Voxels[i]}");
    }

    // Src: common practice (a grid with reversed axes over the same physical space holds the same values, mirrored in index).
    [Theory]
    [InlineData(Interpolation.Nearest)]
    [InlineData(Interpolation.Linear)]
    [InlineData(Interpolation.CubicBSpline)]
    public void FlippedGridOverSameSpaceGivesSamePhysicalValues(Interpolation mode)
    {
        var g = TestGrids.Oblique(Small);
        var input = TestGrids.Random(g, 3);
        var flipped = FlipAllAxes(g);
        var output = Resampler.Resample(input, flipped, null, mode, -1f);
        var n = g.Size;
        for (int k = 0; k < n.Z; k++)
            for (int j = 0; j < n.Y; j++)
                for (int i = 0; i < n.X; i++)
                    Assert.True(Math.Abs(output[i, j, k] - input[n.X - 1 - i, n.Y - 1 - j, n.Z - 1 - k]) <= 1e-2,
                        $"({i},{j},{k}) {output[i, j, k]} vs {input[n.X - 1 - i, n.Y - 1 - j, n.Z - 1 - k]}");
    }

    // Src: common practice (STYLE.md property list: volume unchanged by a direction flip).
    [Theory]
    [InlineData(MaskInterpolation.Nearest)]
    [InlineData(MaskInterpolation.LinearThreshold)]
    public void MaskVolumeUnchangedByDirectionFlip(MaskInterpolation mode)
    {
        var g = TestGrids.Oblique(new Size3(24, 20, 9));
        var mask = TestGrids.Ball(g, 6.0);
        long before = TestGrids.CountNonZero(mask);
        Assert.True(before > 50);
        var flipped = Resampler.ResampleMask(mask, FlipAllAxes(g), null, mode);
        Assert.Equal(before, TestGrids.CountNonZero(flipped));
        Assert.Equal(before * g.VoxelVolumeMm3, TestGrids.CountNonZero(flipped) * flipped.Geometry.VoxelVolumeMm3, 9);
    }

    // Src: trilinear interpolation reproduces affine functions exactly (common practice / definition).
    [Property(MaxTest = 25)]
    public void LinearReproducesRampOnRotatedShiftedGrid(NormalFloat a, NormalFloat b, NormalFloat c)
    {
        var moving = TestGrids.Oblique(new Size3(60, 50, 20));
        var ramp = new Vec3(0.3, -1.7, 2.2);
        double Ramp(Vec3 p) => ramp.Dot(p) + 5.0;
        var input = TestGrids.FromFunction(moving, Ramp);
        var target = InteriorObliqueTarget(moving, a.Get, b.Get, c.Get);
        var transform = SmallRigid(a.Get);
        foreach (var t in new ISpatialTransform?[] { null, transform, new OpaqueTransform(transform) })
        {
            var output = Resampler.Resample(input, target, t, Interpolation.Linear, float.NaN);
            AssertMatches(output, p => Ramp(t?.TransformPoint(p) ?? p), 2e-4);
        }
    }

    // Src: cubic B-spline interpolation reproduces polynomials of degree ≤ 3 (Unser 1991; Thévenaz 2000),
    // up to the mirror-boundary effect that decays as |z|^d, z = √3−2, so only interior points are checked.
    [Fact]
    public void CubicBSplineReproducesQuadraticInInterior()
    {
        var moving = Geometry.Axial(new Size3(36, 36, 36), new Vec3(1.0, 1.2, 0.9), new Vec3(-10, 4, 2));
        var center = moving.CenterMm;
        double Quadratic(Vec3 p)
        {
            var d = p - center;
            return 0.2 * d.X * d.X - 0.15 * d.Y * d.Y + 0.1 * d.Z * d.Z + 0.05 * d.X * d.Y + 0.5 * d.Z + 7;
        }
        var input = TestGrids.FromFunction(moving, Quadratic);
        var target = new Geometry(new Size3(12, 12, 12), new Vec3(0.7, 0.8, 0.65), Vec3.Zero, TestGrids.Rotation(0.3, 0.2, -0.4));
        target = target.With(originMm: center - target.IndexToPhysicalMatrix * new Vec3(5.5, 5.5, 5.5));
        var output = Resampler.Resample(input, target, null, Interpolation.CubicBSpline, float.NaN);
        AssertMatches(output, Quadratic, 1e-3);
        // Trilinear cannot reproduce the curvature, so the check above is not vacuous.
        var linear = Resampler.Resample(input, target, null, Interpolation.Linear, float.NaN);
        Assert.Throws<Xunit.Sdk.TrueException>(() => AssertMatches(linear, Quadratic, 1e-3));
    }

    // Src: common practice (the fast affine path and the general per-voxel path compute the same map).
    [Theory]
    [InlineData(Interpolation.Nearest)]
    [InlineData(Interpolation.Linear)]
    [InlineData(Interpolation.CubicBSpline)]
    public void AffineFastPathMatchesGeneralTransformPath(Interpolation mode)
    {
        var g = TestGrids.Oblique(new Size3(30, 28, 12));
        var input = TestGrids.Random(g, 4);
        var t = SmallRigid(0.05);
        var fast = Resampler.Resample(input, g, t, mode, -5f);
        var general = Resampler.Resample(input, g, new OpaqueTransform(t), mode, -5f);
        int mismatches = 0;
        for (int i = 0; i < fast.Voxels.Length; i++)
            if (Math.Abs(fast.Voxels[i] - general.Voxels[i]) > 1e-2) mismatches++;
        // Nearest may legitimately differ where a point sits within rounding of a voxel boundary.
        Assert.True(mismatches <= (mode == Interpolation.Nearest ? 3 : 0), $"{mismatches} voxels differ");
    }

    // Src: common practice (fixed partitions: results repeat exactly with any thread count).
    [Theory]
    [InlineData(Interpolation.Linear)]
    [InlineData(Interpolation.CubicBSpline)]
    public void SingleAndMultiThreadedResultsAreIdentical(Interpolation mode)
    {
        var g = TestGrids.Oblique(new Size3(33, 31, 14));
        var input = TestGrids.Random(g, 5);
        var t = SmallRigid(0.1);
        var one = Resampler.Resample(input, g, t, mode, 0f, 1);
        var many = Resampler.Resample(input, g, t, mode, 0f, 4);
        Assert.Equal(one.Voxels, many.Voxels);
    }

    [Fact]
    public void PointsOutsideTheMovingImageGetTheOutsideValue()
    {
        var g = TestGrids.Oblique(Small);
        var input = TestGrids.Random(g, 6);
        var far = g.With(originMm: g.OriginMm + new Vec3(500, 0, 0));
        var output = Resampler.Resample(input, far, null, Interpolation.Linear, -7f);
        Assert.All(output.Voxels, v => Assert.Equal(-7f, v));
        var maskOut = Resampler.ResampleMask(TestGrids.Ball(g, 100), far, null);
        Assert.Equal(0, TestGrids.CountNonZero(maskOut));
    }

    // Src: IBSI 1 reference manual, "Interpolation" (facts.md §8): interpolate the mask, re-binarise at 0.5.
    [Fact]
    public void LinearThresholdMaskOnFinerGridKeepsVolumeAndLabel()
    {
        var g = Geometry.Axial(new Size3(30, 30, 30), new Vec3(1, 1, 1), Vec3.Zero);
        var ball = TestGrids.Ball(g, 9.0, label: 3);
        var fine = Geometry.Axial(new Size3(60, 60, 60), new Vec3(0.5, 0.5, 0.5), new Vec3(-0.25, -0.25, -0.25));
        var resampled = Resampler.ResampleMask(ball, fine, null, MaskInterpolation.LinearThreshold);
        double volBefore = TestGrids.CountNonZero(ball) * g.VoxelVolumeMm3;
        double volAfter = TestGrids.CountNonZero(resampled) * fine.VoxelVolumeMm3;
        double sphere = 4.0 / 3.0 * Math.PI * 9 * 9 * 9;
        Assert.InRange(volAfter / sphere, 0.95, 1.05);
        Assert.InRange(volAfter / volBefore, 0.95, 1.05);
        Assert.All(resampled.Voxels, v => Assert.True(v == 0 || v == 3));
    }

    [Fact]
    public void LinearThresholdRefusesLabelMaps()
    {
        var g = Geometry.Axial(new Size3(4, 4, 4), new Vec3(1, 1, 1), Vec3.Zero);
        var m = new Volume<byte>(g);
        m[0, 0, 0] = 1;
        m[1, 1, 1] = 2;
        var ex = Assert.Throws<InvalidParameterException>(() => Resampler.ResampleMask(m, g, null, MaskInterpolation.LinearThreshold));
        Assert.Contains("binary mask", ex.Message);
        Assert.Equal(m.Voxels, Resampler.ResampleMask(m, g, null, MaskInterpolation.Nearest).Voxels);
    }

    [Fact]
    public void SingleSliceImagesResampleInPlane()
    {
        var g = Geometry.Axial(new Size3(8, 8, 1), new Vec3(1, 1, 3), Vec3.Zero);
        var input = TestGrids.FromFunction(g, p => p.X + 2 * p.Y);
        var half = g.With(originMm: new Vec3(0.5, 0.5, 0));
        var output = Resampler.Resample(input, half, null, Interpolation.Linear, float.NaN);
        Assert.Equal(0.5 + 1.0, output[0, 0, 0], 5);
        Assert.Equal(3.5 + 2 * 2.5, output[3, 2, 0], 5);
        var spline = Resampler.Resample(input, g, null, Interpolation.CubicBSpline, float.NaN);
        Assert.Equal(input[5, 6, 0], spline[5, 6, 0], 3);
    }

    private static Geometry FlipAllAxes(Geometry g)
    {
        var n = g.Size;
        var origin = g.IndexToPhysical(n.X - 1, n.Y - 1, n.Z - 1);
        return g.With(originMm: origin, direction: g.Direction * Mat3.Diagonal(new Vec3(-1, -1, -1)));
    }

    /// <summary>A rotated, shifted target grid whose points (and their images under small rigid maps) stay inside.</summary>
    private static Geometry InteriorObliqueTarget(Geometry moving, double a, double b, double c)
    {
        var rot = TestGrids.Rotation(0.3 * Math.Sin(a), 0.3 * Math.Sin(b), 0.3 * Math.Sin(c));
        var t = new Geometry(new Size3(9, 8, 7), new Vec3(0.9, 1.1, 1.3), Vec3.Zero, rot * moving.Direction);
        var shift = new Vec3(Math.Sin(a + b), Math.Cos(c), Math.Sin(c - a));
        return t.With(originMm: moving.CenterMm + shift - t.IndexToPhysicalMatrix * new Vec3(4, 3.5, 3));
    }

    /// <summary>A small rotation about the LPS origin (a few tenths of a degree to a degree), plus a shift.</summary>
    private static AffineTransform SmallRigid(double seed)
    {
        var r = TestGrids.Rotation(0.01, -0.01, 0.02 * Math.Sin(seed));
        return new AffineTransform(r, new Vec3(0.4, -0.3, 0.2));
    }

    private static void AssertMatches(Volume<float> output, Func<Vec3, double> truth, double relTol)
    {
        var g = output.Geometry;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    double expected = truth(g.IndexToPhysical(i, j, k));
                    double got = output[i, j, k];
                    Assert.True(Math.Abs(got - expected) <= relTol * Math.Max(1, Math.Abs(expected)),
                        $"({i},{j},{k}): {got} vs {expected}");
                }
    }
}
