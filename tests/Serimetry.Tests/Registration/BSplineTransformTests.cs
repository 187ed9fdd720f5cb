using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Deformable;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Optimizers;
using Serimetry.Engine.Registration.Transforms;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>
/// The cubic B-spline deformation against properties known from spline theory, its gradients against
/// finite differences, and its transform.json form.
/// </summary>
public class BSplineTransformTests
{
    private static readonly Geometry Domain = Geometry.Axial(new Size3(40, 36, 12), new Vec3(1.0, 1.0, 3.0), new Vec3(-20, -25, -10));

    private static BSplineDeformation FromField(Func<Vec3, Vec3> field, AffineTransform? bulk = null)
    {
        var t = BSplineDeformation.Covering(Domain, 10, bulk ?? AffineTransform.Identity);
        int n = t.PointCount, nx = t.GridSize.X, ny = t.GridSize.Y;
        var c = new double[3 * n];
        for (int p = 0; p < n; p++)
        {
            int i = p % nx, j = p / nx % ny, k = p / (nx * ny);
            var pos = t.GridOriginMm + t.GridDirection * new Vec3(i * t.GridSpacingMm.X, j * t.GridSpacingMm.Y, k * t.GridSpacingMm.Z);
            var v = field(pos);
            c[p] = v.X; c[n + p] = v.Y; c[2 * n + p] = v.Z;
        }
        return t.With(coefficients: c);
    }

    [Fact]
    public void ReproducesLinearFieldsExactlyInsideTheDomain()
    {
        // Src: cubic B-splines reproduce polynomials of degree ≤ 1 (de Boor, A Practical Guide to Splines):
        // coefficients sampled from u(x) = L·x + t give exactly that u, and det(∂T/∂x) = det(I + L).
        var l = new Mat3(0.05, -0.02, 0.01, 0.03, -0.1, 0.02, 0.0, 0.04, 0.08);
        var shift = new Vec3(1.5, -2, 0.5);
        var t = FromField(x => l * x + shift);
        var expectedDet = new Mat3(1 + l.M00, l.M01, l.M02, l.M10, 1 + l.M11, l.M12, l.M20, l.M21, 1 + l.M22).Determinant;
        var rng = new Random(3);
        for (int s = 0; s < 200; s++)
        {
            var x = Domain.IndexToPhysical(new Vec3(rng.NextDouble() * 39, rng.NextDouble() * 35, rng.NextDouble() * 11));
            var expected = x + l * x + shift;
            Assert.True((t.TransformPoint(x) - expected).Norm < 1e-9, $"at {x}: {t.TransformPoint(x)} vs {expected}");
            Assert.Equal(expectedDet, t.JacobianDeterminant(x), 9);
        }
        var mask = new Volume<byte>(Domain);
        mask[10, 10, 5] = 1; mask[30, 20, 6] = 1;
        Assert.Equal(expectedDet, JacobianVolume.JacobianVolumeChange(t, mask), 9);
    }

    [Fact]
    public void SpatialJacobianMatchesFiniteDifferencesWithBulkRotation()
    {
        // Src: common practice — analytic ∂T/∂x against central differences of T.
        var bulk = RegistrationPhantom.Rigid(4, -3, 6, new Vec3(2, 1, -1));
        var t = FromField(x => new Vec3(Math.Sin(x.X / 9), Math.Cos(x.Y / 7) * 0.8, Math.Sin((x.Z + x.X) / 11)), bulk);
        var x = new Vec3(3.3, -7.1, 4.2);
        var j = t.SpatialJacobian(x);
        const double h = 1e-4;
        for (int a = 0; a < 3; a++)
        {
            var e = a == 0 ? new Vec3(h, 0, 0) : a == 1 ? new Vec3(0, h, 0) : new Vec3(0, 0, h);
            var col = (t.TransformPoint(x + e) - t.TransformPoint(x - e)) / (2 * h);
            for (int r = 0; r < 3; r++) Assert.Equal(col[r], j[r, a], 6);
        }
    }

    [Fact]
    public void AnalyticObjectiveGradientMatchesFiniteDifferences()
    {
        // Src: common practice — gradient of (mean squares + bending energy) wrt the coefficients against
        // central differences of the objective.
        var (grid, f, m) = ShiftedPair(PhantomContrast.T2w);
        var (t, c) = RandomCoefficients(BSplineDeformation.Covering(grid, 12, AffineTransform.Identity), seed: 5, amplitude: 1);
        var metric = new BSplineMeanSquares(SampleSet.Draw(f, null, 4000, 9), new LinearInterpolator(m), -1, t);
        const double weight = 50;
        var grad = new double[c.Length];
        DeformableStage.Objective(metric, t, weight, grad);
        Assert.True(grad.Max(Math.Abs) > 0);
        AssertCentralDifferences(c, grad, cc => DeformableStage.Objective(metric, t.With(coefficients: cc), weight, default),
            new FdProbe(First: 0, Stride: 37, Most: 24, Step: 1e-5, RelativeTolerance: 1e-3, AbsoluteTolerance: 1e-9));
    }

    [Fact]
    public void MutualInformationGradientMatchesFiniteDifferences()
    {
        // Src: common practice — analytic ∂(−MI)/∂c (Mattes et al., IEEE TMI 22(1), 2003) against central differences.
        var (grid, f, m) = ShiftedPair(PhantomContrast.Adc);
        var (t, c) = RandomCoefficients(BSplineDeformation.Covering(grid, 12, AffineTransform.Identity), seed: 6, amplitude: 1);
        var set = SampleSet.Draw(f, null, 4000, 9);
        var metric = new BSplineMutualInformation(set, new LinearInterpolator(m), -1, 32, (f.Voxels.Min(), f.Voxels.Max()), (m.Voxels.Min(), m.Voxels.Max()));
        var grad = new double[c.Length];
        double value = metric.Evaluate(t, grad);
        Assert.True(value < 0);
        Assert.True(grad.Max(Math.Abs) > 0);
        AssertCentralDifferences(c, grad, cc => metric.Evaluate(t.With(coefficients: cc), default),
            new FdProbe(First: 0, Stride: 37, Most: 24, Step: 1e-5, RelativeTolerance: 2e-3, AbsoluteTolerance: 1e-9));
    }

    [Fact]
    public void FoldingGuardGradientMatchesFiniteDifferencesAndVanishesAboveThreshold()
    {
        // Src: common practice (central differences); Jacobi's formula ∂det J/∂J = cof J.
        var (t, c) = RandomCoefficients(BSplineDeformation.Covering(Domain, 10, AffineTransform.Identity), seed: 8, amplitude: 3);
        const double threshold = 1.0;
        var grad = new double[c.Length];
        double value = JacobianPenalty.Evaluate(t, threshold, 1, grad);
        Assert.True(value > 0);
        AssertCentralDifferences(c, grad, cc => JacobianPenalty.Evaluate(t.With(coefficients: cc), threshold, 1, default),
            new FdProbe(First: 5, Stride: 53, Most: int.MaxValue, Step: 1e-6, RelativeTolerance: 1e-4, AbsoluteTolerance: 1e-10));
        // A 10 % uniform compression (det 0.9 everywhere) is above a 0.5 threshold: no penalty.
        var compressed = FromField(x => new Vec3(0, -0.1 * x.Y, 0));
        Assert.Equal(0, JacobianPenalty.Evaluate(compressed, 0.5, 1, default));
    }

    [Fact]
    public void BendingEnergyIsZeroForAffineFieldsAndPositiveOtherwise()
    {
        // Src: thin-plate bending energy vanishes exactly on affine fields (Rueckert et al., IEEE TMI 1999).
        var affine = FromField(x => new Mat3(0.1, 0.02, 0, 0, -0.05, 0.03, 0.01, 0, 0.02) * x + new Vec3(1, 2, 3));
        Assert.Equal(0, BendingEnergy.Evaluate(affine, 1, default), 12);
        var bent = FromField(x => new Vec3(0, 0.01 * x.X * x.X, 0));
        // u_y = 0.01 x² → ∂²u_y/∂x² = 0.02 mm⁻¹ everywhere: the energy is 0.02² = 4e-4 mm⁻².
        Assert.Equal(4e-4, BendingEnergy.Evaluate(bent, 1, default), 9);
    }

    [Fact]
    public void TransformFileRoundTripKeepsTheMap()
    {
        var grid = RegistrationPhantom.T2Grid(32, 32, 8, 2, 3);
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.01, 3);
        var m = RegistrationPhantom.Render(grid, new AffineTransform(Mat3.Identity, new Vec3(0.5, 0, 0)), PhantomContrast.T2w, 0.01, 4);
        var options = RegistrationOptions.ForPreset("deformable") with
        {
            Levels = [new(2, 2000, 20, 1, 0.01)],
            BSpline = new BSplineStageOptions { Levels = [new(2, 2000, 10, 2, 0.01)] },
        };
        var r = Registrar.Register(f, m, options);
        var d = r.Deformation!;
        var path = Path.Combine(Path.GetTempPath(), $"serimetry-bspline-{Guid.NewGuid():N}.json");
        try
        {
            TransformFile.Write(path, r);
            var back = TransformFile.Read(path);
            Assert.Equal("bspline", back.Type);
            Assert.NotNull(back.Deformation);
            Assert.Equal(d.GridSize, back.Deformation.GridSize);
            var rng = new Random(1);
            for (int s = 0; s < 50; s++)
            {
                var x = grid.IndexToPhysical(new Vec3(rng.NextDouble() * 31, rng.NextDouble() * 31, rng.NextDouble() * 7));
                Assert.True((d.TransformPoint(x) - back.Deformation.TransformPoint(x)).Norm < 1e-9);
            }
            Assert.Equal(r.Transform.ToMatrix4x4(), back.Transform.ToMatrix4x4());
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void TruncatedCoefficientsAreAClearInputError()
    {
        var t = BSplineDeformation.Covering(Domain, 10, AffineTransform.Identity);
        var block = BSplineJson.ToJson(t);
        block["coefficientsMm"]!["y"]!.AsArray().RemoveAt(0);
        var e = Assert.Throws<InputFormatException>(() => BSplineJson.Read(block, AffineTransform.Identity, "transform.json"));
        Assert.Contains("coefficientsMm.y", e.Message);
    }

    [Fact]
    public void InvalidStageSettingsAreParameterErrors()
    {
        var grid = RegistrationPhantom.T2Grid(24, 24, 6, 2, 3);
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.01, 3);
        var bad = RegistrationOptions.ForPreset("deformable") with { BSpline = new BSplineStageOptions { GridSpacingMm = 0 } };
        var e = Assert.Throws<InvalidParameterException>(() => Registrar.Register(f, f, bad));
        Assert.Contains("B-spline", e.Message);
        Assert.Throws<InvalidParameterException>(() => BSplineDeformation.Covering(grid, -1, AffineTransform.Identity));
        Assert.Throws<InvalidParameterException>(() => new BSplineDeformation(AffineTransform.Identity, Vec3.Zero, new Vec3(10, 10, 10),
            new Size3(4, 4, 4), Mat3.Identity, new double[5]));
    }

    [Fact]
    public void TimeLimitStopsTheBSplineStageAndIsReported()
    {
        var grid = RegistrationPhantom.T2Grid(32, 32, 8, 2, 3);
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.01, 3);
        var m = RegistrationPhantom.Render(grid, new AffineTransform(Mat3.Identity, new Vec3(0.5, 0, 0)), PhantomContrast.T2w, 0.01, 4);
        var r = Registrar.Register(f, m, RegistrationOptions.ForPreset("deformable") with { TimeLimit = TimeSpan.FromTicks(1) });
        Assert.NotNull(r.Deformation);
        Assert.All(r.DeformationLevels, l => Assert.Equal(StopReason.TimeLimit, l.StopReason));
        Assert.Contains(r.Warnings, w => w.Contains("deformable", StringComparison.Ordinal));
    }

    [Fact]
    public void DeformablePresetIsNamed()
    {
        Assert.Contains("deformable", RegistrationOptions.PresetNames);
        var o = RegistrationOptions.ForPreset("deformable");
        Assert.NotNull(o.BSpline);
        Assert.Equal(TransformKind.Rigid, o.Transform);
        Assert.Null(RegistrationOptions.ForPreset("rigid").BSpline);
    }

    /// <summary>A small T2w fixed image and a moving image of <paramref name="movingContrast"/> shifted by (1, −0.5, 0.7) mm.</summary>
    private static (Geometry Grid, Volume<float> Fixed, Volume<float> Moving) ShiftedPair(PhantomContrast movingContrast)
    {
        var grid = RegistrationPhantom.T2Grid(48, 48, 12, 1.5, 3);
        return (grid, RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 1),
            RegistrationPhantom.Render(grid, new AffineTransform(Mat3.Identity, new Vec3(1, -0.5, 0.7)), movingContrast, 0.02, 2));
    }

    /// <summary>Which coefficients a finite-difference check probes, its step and its tolerance (relative to the largest gradient entry).</summary>
    private sealed record FdProbe(int First, int Stride, int Most, double Step, double RelativeTolerance, double AbsoluteTolerance);

    /// <summary>The transform with every coefficient drawn uniformly from ±<paramref name="amplitude"/> (mm).</summary>
    private static (BSplineDeformation T, double[] C) RandomCoefficients(BSplineDeformation t0, int seed, double amplitude)
    {
        var rng = new Random(seed);
        var c = new double[t0.Coefficients.Count];
        for (int i = 0; i < c.Length; i++) c[i] = amplitude * (rng.NextDouble() * 2 - 1);
        return (t0.With(coefficients: c), c);
    }

    /// <summary>Asserts the analytic gradient equals central differences of <paramref name="objective"/> at the probed coefficients.</summary>
    private static void AssertCentralDifferences(double[] c, double[] grad, Func<double[], double> objective, FdProbe probe)
    {
        double maxAbs = grad.Max(Math.Abs);
        int compared = 0;
        for (int q = probe.First; q < c.Length && compared < probe.Most; q += probe.Stride)
        {
            var plus = (double[])c.Clone(); plus[q] += probe.Step;
            var minus = (double[])c.Clone(); minus[q] -= probe.Step;
            double fd = (objective(plus) - objective(minus)) / (2 * probe.Step);
            Assert.True(Math.Abs(fd - grad[q]) <= probe.RelativeTolerance * maxAbs + probe.AbsoluteTolerance,
                $"coefficient {q}: analytic {grad[q]:G6} vs FD {fd:G6}");
            compared++;
        }
        Assert.True(compared > 0);
    }
}
