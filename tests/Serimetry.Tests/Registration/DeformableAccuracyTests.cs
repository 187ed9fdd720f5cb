using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Registration;

/// <summary>
/// The <c>deformable</c> preset against synthetic truth: an analytic phantom rendered through a known smooth
/// compression (<see cref="DeformedPhantom"/>), so the true displacement and Jacobian are known exactly.
/// </summary>
public class DeformableAccuracyTests(ITestOutputHelper output)
{
    private static readonly Geometry Grid = RegistrationPhantom.T2Grid(64, 64, 16, 1.0, 3.0);

    [Fact]
    public void RecoversTenPercentGlandCompression()
    {
        // Src: synthetic truth — 10 % compression along y (AP) at the gland centre plus a small shift.
        var truth = new DeformedPhantom(0.10, 1, 25, new Vec3(1.2, -0.8, 1.5));
        var f = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 11);
        var m = truth.Render(Grid, 0.02, 12);
        var gland = RegistrationPhantom.GlandMask(Grid);
        var r = Registrar.Register(f, m, RegistrationOptions.ForPreset("deformable"), gland);
        Assert.NotNull(r.Deformation);
        Assert.Equal("bspline", r.TransformType);
        Assert.Equal("normalized-mean-squares", r.DeformationMetricName); // same contrast: the automatic choice

        double rigidError = RegistrationPhantom.GlandTre(Grid, r.Transform, truth);
        double error = RegistrationPhantom.GlandTre(Grid, r.Deformation, truth);
        double ratio = JacobianVolume.JacobianVolumeChange(r.Deformation, gland);
        double trueRatio = TrueVolumeRatio(truth, gland);
        double minDet = Min(r.Deformation.JacobianDeterminantField(Grid).Voxels);
        output.WriteLine($"mean error: affine part {rigidError:F3} mm, with B-spline {error:F3} mm; volume ratio {ratio:F4} vs true {trueRatio:F4}; min det {minDet:F3}; {r.ElapsedSeconds:F1} s");
        output.WriteLine(string.Join("; ", r.DeformationLevels.Select(l => $"{l.Iterations} it {l.StopReason} {l.MetricStart:F4}->{l.MetricEnd:F4}")));
        Assert.True(error <= 1.0, $"mean displacement error {error:F3} mm > 1 mm");
        Assert.True(error < 0.6 * rigidError, $"the B-spline stage did not improve on the bulk transform ({error:F3} vs {rigidError:F3} mm)");
        Assert.True(Math.Abs(ratio / trueRatio - 1) <= 0.03, $"Jacobian volume ratio {ratio:F4} vs true {trueRatio:F4}");
        Assert.True(minDet > 0, $"the deformation folds: min det {minDet}");
    }

    [Fact]
    public void MutualInformationStageMatchesMeanSquaresOnSameContrast()
    {
        // Src: synthetic truth — the compression case above with the B-spline stage forced to Mattes MI.
        var truth = new DeformedPhantom(0.10, 1, 25, new Vec3(1.2, -0.8, 1.5));
        var f = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 11);
        var m = truth.Render(Grid, 0.02, 12);
        var gland = RegistrationPhantom.GlandMask(Grid);
        var preset = RegistrationOptions.ForPreset("deformable");
        var r = Registrar.Register(f, m, preset with { BSpline = preset.BSpline! with { Metric = MetricKind.MattesMutualInformation } }, gland);
        var (error, ratio, trueRatio, minDet) = Score(r, truth, gland);
        double rigidError = RegistrationPhantom.GlandTre(Grid, r.Transform, truth);
        output.WriteLine($"{r.DeformationMetricName}: error {error:F3} mm (affine part {rigidError:F3}), volume ratio {ratio:F4} vs true {trueRatio:F4}, min det {minDet:F3}, {r.ElapsedSeconds:F1} s");
        Assert.Equal("mattes-mi", r.DeformationMetricName);
        // Src: issue 3 acceptance — mean displacement error ≤ 1 mm, gland Jacobian within 3 % of truth, no folding.
        Assert.True(error <= 1.0 && error < 0.6 * rigidError, $"mean displacement error {error:F3} mm (affine part {rigidError:F3})");
        Assert.True(Math.Abs(ratio / trueRatio - 1) <= 0.03, $"Jacobian volume ratio {ratio:F4} vs true {trueRatio:F4}");
        Assert.True(minDet > 0, $"the deformation folds: min det {minDet}");
    }

    [Fact]
    public void AcrossContrastsThePresetChoosesMutualInformation()
    {
        // Src: synthetic truth — the compression case with the follow-up rendered in the phantom's ADC-like contrast:
        // the automatic choice must pick MI, and MI must beat mean squares forced on the same pair.
        var truth = new DeformedPhantom(0.10, 1, 25, new Vec3(1.2, -0.8, 1.5));
        var f = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 11);
        var m = truth.Render(Grid, 0.02, 12, PhantomContrast.Adc);
        var gland = RegistrationPhantom.GlandMask(Grid);
        var preset = RegistrationOptions.ForPreset("deformable");
        var mi = Registrar.Register(f, m, preset, gland);
        var msq = Registrar.Register(f, m, preset with { BSpline = preset.BSpline! with { Metric = MetricKind.MeanSquares } }, gland);
        var (miError, miRatio, trueRatio, minDet) = Score(mi, truth, gland);
        var (msqError, msqRatio, _, _) = Score(msq, truth, gland);
        output.WriteLine($"MI: error {miError:F3} mm, ratio {miRatio:F4}; mean squares: {msqError:F3} mm, {msqRatio:F4}; true ratio {trueRatio:F4}; min det {minDet:F3}");
        Assert.Equal("mattes-mi", mi.DeformationMetricName);
        // Src: issue 3 acceptance — mean displacement error ≤ 1 mm; no folding.
        Assert.True(miError <= 1.0, $"MI error {miError:F3} mm");
        Assert.True(miError < msqError, $"MI {miError:F3} mm vs mean squares {msqError:F3} mm");
        Assert.True(Math.Abs(miRatio - trueRatio) < Math.Abs(msqRatio - trueRatio), $"MI ratio {miRatio:F4}, mean squares {msqRatio:F4}, true {trueRatio:F4}");
        Assert.True(minDet > 0, $"the deformation folds: min det {minDet}");
    }

    private static (double Error, double Ratio, double TrueRatio, double MinDet) Score(RegistrationResult r, DeformedPhantom truth, Volume<byte> gland) =>
        (RegistrationPhantom.GlandTre(Grid, r.Deformation!, truth), JacobianVolume.JacobianVolumeChange(r.Deformation!, gland),
            TrueVolumeRatio(truth, gland), Min(r.Deformation!.JacobianDeterminantField(Grid).Voxels));

    [Fact]
    public void DoesNotInventDeformationInNoise()
    {
        // Src: synthetic truth — the same anatomy, independent noise, a pure shift: the true u is 0.
        var shift = new Vec3(1.0, 0.5, -1.0);
        var f = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 21);
        var m = RegistrationPhantom.Render(Grid, new AffineTransform(Mat3.Identity, shift), PhantomContrast.T2w, 0.02, 22);
        var gland = RegistrationPhantom.GlandMask(Grid);
        var r = Registrar.Register(f, m, RegistrationOptions.ForPreset("deformable"), gland);
        var d = r.Deformation!;
        double sum = 0;
        int n = 0;
        foreach (var p in GlandPoints(gland)) { sum += d.Displacement(p).Norm; n++; }
        double meanU = sum / n;
        double ratio = JacobianVolume.JacobianVolumeChange(d, gland);
        output.WriteLine($"mean |u| over gland {meanU:F3} mm; volume ratio {ratio:F4}");
        Assert.True(meanU < 0.3, $"mean |u| {meanU:F3} mm in a case without deformation");
        Assert.InRange(ratio, 0.99, 1.01);
    }

    [Fact]
    public void SameResultWithAnyThreadCount()
    {
        // Src: project rule — results must not depend on the number of threads.
        var grid = RegistrationPhantom.T2Grid(40, 40, 10, 1.5, 3.0);
        var truth = new DeformedPhantom(0.10, 0, 25, Vec3.Zero);
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 41);
        var m = truth.Render(grid, 0.02, 42);
        var options = RegistrationOptions.ForPreset("deformable") with
        {
            Levels = [new(2, 3000, 30, 1, 0.01)],
            BSpline = new BSplineStageOptions { Levels = [new(1, 5000, 15, 2, 0.01)] },
        };
        var one = Registrar.Register(f, m, options with { MaxThreads = 1 }).Deformation!;
        var many = Registrar.Register(f, m, options with { MaxThreads = 4 }).Deformation!;
        Assert.Equal(one.Coefficients, many.Coefficients);
        Assert.Contains(one.Coefficients, c => c != 0);
    }

    internal static IEnumerable<Vec3> GlandPoints(Volume<byte> mask)
    {
        var g = mask.Geometry;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    if (mask[i, j, k] != 0) yield return g.IndexToPhysical(i, j, k);
    }

    private static double TrueVolumeRatio(DeformedPhantom truth, Volume<byte> gland)
    {
        double sum = 0;
        int n = 0;
        foreach (var p in GlandPoints(gland)) { sum += truth.JacobianDeterminant(p); n++; }
        return sum / n;
    }

    private static float Min(float[] v)
    {
        float min = float.PositiveInfinity;
        foreach (var x in v) if (x < min) min = x;
        return min;
    }
}
