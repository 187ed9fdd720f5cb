using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Pyramid;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>Multi-resolution pyramid geometry and the bias-field estimate.</summary>
public class PyramidAndBiasTests(Xunit.Abstractions.ITestOutputHelper output)
{
    [Theory]
    [InlineData(4.0, 4, 1)]
    [InlineData(8.0, 8, 2)]
    [InlineData(1.0, 1, 1)]
    public void AnisotropicVoxelsShrinkLessAlongTheThickAxis(double factor, int inPlane, int slice)
    {
        var grid = RegistrationPhantom.T2Grid(64, 64, 12, 0.6, 3.0);
        var image = new Volume<float>(grid);
        image.Span.Fill(5);
        var level = ResolutionLevel.Build(image, null, image, factor, null, 0.6, 1);
        Assert.Equal(new Size3(inPlane, inPlane, slice), level.FixedShrink);
        // Common practice (ITK shrink filters): coarse voxel centres sit at the centres of the blocks they replace.
        var g = level.Fixed.Geometry;
        var expectedFirst = grid.IndexToPhysical(new Vec3((inPlane - 1) / 2.0, (inPlane - 1) / 2.0, (slice - 1) / 2.0));
        Assert.True((g.OriginMm - expectedFirst).Norm < 1e-9);
        Assert.Equal(grid.SpacingMm.X * inPlane, g.SpacingMm.X, 12);
        Assert.Equal(grid.SpacingMm.Z * slice, g.SpacingMm.Z, 12);
        // Smoothing keeps a constant image constant (normalised kernel).
        Assert.All(level.Fixed.Voxels, v => Assert.Equal(5f, v, 4));
    }

    [Fact]
    public void SmoothingKernelIsNormalisedAndHasTheRequestedWidth()
    {
        var k = GaussianSmoothing.Kernel(2.0);
        Assert.Equal(1.0, k.Sum(x => (double)x), 6);
        int r = k.Length / 2;
        double variance = 0;
        for (int i = 0; i < k.Length; i++) variance += k[i] * (i - r) * (double)(i - r);
        Assert.Equal(4.0, variance, 1); // σ² of a 3σ-truncated sampled Gaussian, from memory: slightly below σ²
    }

    [Fact]
    public void BiasCorrectionReducesAKnownSmoothField()
    {
        var grid = RegistrationPhantom.T2Grid(96, 96, 16, 1.0, 3.0);
        var clean = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0, 1, sliceSubsamples: 1);
        var biased = clean.Clone();
        for (int k = 0; k < grid.Size.Z; k++)
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                {
                    var p = (grid.IndexToPhysical(i, j, k) - grid.CenterMm) / 50.0;
                    biased[i, j, k] *= (float)Math.Exp(0.25 * p.X - 0.2 * p.Y + 0.15 * p.X * p.X);
                }
        var corrected = BiasFieldCorrection.Correct(biased);
        double before = RatioSpread(biased, clean), after = RatioSpread(corrected, clean);
        // The quadratic fit also absorbs some slowly varying anatomy, so only part of the field goes (measured: about half).
        Assert.True(after < 0.6 * before, $"log-ratio SD to the clean image: {before:F4} before, {after:F4} after");
    }

    [Theory]
    [InlineData(411)]
    [InlineData(412)]
    [InlineData(413)]
    public void BiasCorrectionImprovesRigidTreWithDifferentBiasFields(int seed)
    {
        // Src: synthetic truth — known rigid motion, a different smooth multiplicative field in each visit
        // (issue 3: different bias fields are what limits mutual-information accuracy).
        var pair = RigidCase.Make(seed);
        var with = Registrar.Register(pair.Fixed, pair.Moving, RegistrationOptions.Rigid(), pair.GlandMask);
        var without = Registrar.Register(pair.Fixed, pair.Moving, RegistrationOptions.Rigid() with { CorrectBias = false }, pair.GlandMask);
        double a = pair.GlandTre(with.Transform), b = pair.GlandTre(without.Transform);
        output.WriteLine($"seed {seed}: TRE {a:F3} mm with correction ({with.ElapsedSeconds:F2} s), {b:F3} mm without ({without.ElapsedSeconds:F2} s)");
        Assert.True(a < b, $"TRE {a:F3} mm with correction vs {b:F3} mm without");
    }

    /// <summary>SD of log(image / clean) over body voxels: zero when the image is the clean one times a constant.</summary>
    private static double RatioSpread(Volume<float> image, Volume<float> clean)
    {
        double s = 0, s2 = 0;
        int n = 0;
        for (int i = 0; i < clean.Voxels.Length; i++)
        {
            if (clean.Voxels[i] < 0.2) continue;
            double r = Math.Log(image.Voxels[i] / clean.Voxels[i]);
            s += r; s2 += r * r; n++;
        }
        double mean = s / n;
        return Math.Sqrt(Math.Max(0, s2 / n - mean * mean));
    }
}
