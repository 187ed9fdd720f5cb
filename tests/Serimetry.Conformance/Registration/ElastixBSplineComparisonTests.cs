using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.Registration;

/// <summary>
/// Reference: elastix 5 (Debian package <c>elastix</c>), EulerTransform then BSplineTransform (12 mm final
/// grid, AdvancedMattesMutualInformation, adaptive stochastic gradient descent, 200 iterations per level)
/// on the same known-truth case as the unit tests: the analytic phantom compressed by 10 % along y at the
/// gland plus a shift. Truth is analytic; our mean gland displacement error must be no worse than
/// elastix's + 0.1 mm and our gland volume ratio at least as close to the truth as elastix's + 1 %.
/// </summary>
public class ElastixBSplineComparisonTests(ITestOutputHelper output)
{
    [Fact]
    public void DeformableIsAsAccurateAsElastixBSpline()
    {
        Assert.True(ElastixReference.Available, "elastix is not installed (scripts/test.sh installs the Debian package)");
        var grid = RegistrationPhantom.T2Grid(64, 64, 16, 1.0, 3.0);
        var truth = new DeformedPhantom(0.10, 1, 25, new Vec3(1.2, -0.8, 1.5));
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 31);
        var m = truth.Render(grid, 0.02, 32);
        var gland = RegistrationPhantom.GlandMask(grid);
        var options = RegistrationOptions.ForPreset("deformable");
        var ours = Registrar.Register(f, m, options, gland);
        var work = Path.Combine(Path.GetTempPath(), $"serimetry-elastix-bspline-{Guid.NewGuid():N}");
        try
        {
            var rigidSchedule = string.Join(" ", ours.Levels.SelectMany(l => new[] { l.FixedShrink.X, l.FixedShrink.Y, l.FixedShrink.Z }));
            var bsplineSchedule = string.Join(" ", ours.DeformationLevels.SelectMany(l => new[] { l.FixedShrink.X, l.FixedShrink.Y, l.FixedShrink.Z }));
            var elastix = ElastixBSplineRunner.Run(f, m, MaskOps.DilateBox(gland, options.MaskDilationMm), rigidSchedule, bsplineSchedule,
                options.BSpline!.GridSpacingMm, work);
            double ourError = RegistrationPhantom.GlandTre(grid, ours.FullTransform, truth);
            double refError = RegistrationPhantom.GlandTre(grid, elastix.Transform, truth);
            double trueRatio = MeanOverGland(gland, truth.JacobianDeterminant);
            double ourRatio = JacobianVolume.JacobianVolumeChange(ours.Deformation!, gland);
            double refRatio = MeanOverGland(gland, p => NumericDeterminant(elastix.Transform, p));
            output.WriteLine($"Serimetry: error {ourError:F3} mm, volume ratio {ourRatio:F4}, {ours.ElapsedSeconds:F1} s; " +
                $"elastix: error {refError:F3} mm, volume ratio {refRatio:F4}, {elastix.WallSeconds:F1} s; true ratio {trueRatio:F4}");
            Assert.True(ourError <= refError + 0.1, $"error {ourError:F3} mm vs elastix {refError:F3} mm");
            Assert.True(Math.Abs(ourRatio / trueRatio - 1) <= Math.Abs(refRatio / trueRatio - 1) + 0.01,
                $"volume ratio {ourRatio:F4} vs elastix {refRatio:F4} (true {trueRatio:F4})");
        }
        finally
        {
            if (Directory.Exists(work)) Directory.Delete(work, true);
        }
    }

    private static double MeanOverGland(Volume<byte> gland, Func<Vec3, double> f)
    {
        var g = gland.Geometry;
        double sum = 0;
        int n = 0;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    if (gland[i, j, k] != 0) { sum += f(g.IndexToPhysical(i, j, k)); n++; }
        return sum / n;
    }

    private static double NumericDeterminant(ISpatialTransform t, Vec3 p)
    {
        const double h = 0.01;
        Vec3 D(Vec3 e) => (t.TransformPoint(p + e * h) - t.TransformPoint(p - e * h)) / (2 * h);
        return Mat3.FromColumns(D(new Vec3(1, 0, 0)), D(new Vec3(0, 1, 0)), D(new Vec3(0, 0, 1))).Determinant;
    }
}
