using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Optimizers;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>Bad input, bounds, determinism and the transform.json round trip.</summary>
public class RegistrarBehaviourTests
{
    private static readonly Geometry Grid = RegistrationPhantom.T2Grid(64, 64, 16, 1.5, 3);

    private static readonly Lazy<(Volume<float> F, Volume<float> M, AffineTransform Truth)> Pair = new(() =>
    {
        var truth = RegistrationPhantom.Rigid(4, -3, 5, new Vec3(3, -4, 2));
        return (RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.03, 1),
                RegistrationPhantom.Render(Grid, truth, PhantomContrast.T2w, 0.03, 2), truth);
    });

    private static RegistrationOptions Fast => RegistrationOptions.Rigid() with
    {
        Levels = [new(2, 3000, 100, 2, 0.01), new(1, 6000, 100, 0.5, 0.005)],
    };

    [Fact]
    public void ImagesWithoutPhysicalOverlapAreRefusedWithAFix()
    {
        var (f, m, _) = Pair.Value;
        var far = new Volume<float>(m.Geometry.With(originMm: m.Geometry.OriginMm + new Vec3(0, 0, 500)), m.Voxels);
        var e = Assert.Throws<RegistrationException>(() => Registrar.Register(f, far, Fast with { Initialization = InitializationKind.Identity }));
        Assert.Contains("do not overlap", e.Message);
        Assert.False(string.IsNullOrEmpty(e.Fix));
    }

    [Fact]
    public void ConstantImageIsRefused()
    {
        var (f, _, _) = Pair.Value;
        var flat = new Volume<float>(Grid);
        flat.Span.Fill(7);
        var e = Assert.Throws<RegistrationException>(() => Registrar.Register(f, flat, Fast));
        Assert.Contains("constant", e.Message);
    }

    [Fact]
    public void EmptyMaskIsRefused()
    {
        var (f, m, _) = Pair.Value;
        var e = Assert.Throws<RegistrationException>(() => Registrar.Register(f, m, Fast, new Volume<byte>(Grid)));
        Assert.Contains("mask is empty", e.Message);
    }

    [Fact]
    public void MovingMaskRestrictsTheSamplesAndStillAligns()
    {
        var (f, m, truth) = Pair.Value;
        // The follow-up gland mask: the baseline gland carried by the true motion.
        var movingGland = new Volume<byte>(Grid);
        var inverse = truth.Inverse();
        for (int k = 0; k < Grid.Size.Z; k++)
            for (int j = 0; j < Grid.Size.Y; j++)
                for (int i = 0; i < Grid.Size.X; i++)
                    if (RegistrationPhantom.InGland(inverse.TransformPoint(Grid.IndexToPhysical(i, j, k)))) movingGland[i, j, k] = 1;
        var r = Registrar.Register(f, m, Fast, RegistrationPhantom.GlandMask(Grid), null, movingGland);
        Assert.True(RegistrationPhantom.GlandTre(Grid, r.Transform, truth) < 0.5);
        Assert.Throws<RegistrationException>(() => Registrar.Register(f, m, Fast, null, null, new Volume<byte>(Grid)));
    }

    [Fact]
    public void MaskOnAnotherGridIsAnInputError()
    {
        var (f, m, _) = Pair.Value;
        var other = new Volume<byte>(RegistrationPhantom.T2Grid(32, 32, 16, 3, 3));
        Assert.Throws<GeometryMismatchException>(() => Registrar.Register(f, m, Fast, other));
    }

    [Fact]
    public void NonFiniteVoxelsAreReplacedAndFlagged()
    {
        var (f, m, truth) = Pair.Value;
        var holes = m.Clone();
        for (int i = 0; i < holes.Voxels.Length; i += 997) holes.Voxels[i] = float.NaN;
        var r = Registrar.Register(f, holes, Fast);
        Assert.Contains(r.Warnings, w => w.Contains("non-finite"));
        Assert.True(RegistrationPhantom.GlandTre(Grid, r.Transform, truth) < 1.0);
    }

    [Fact]
    public void IterationBudgetIsReportedAsStopReason()
    {
        var (f, m, _) = Pair.Value;
        var r = Registrar.Register(f, m, Fast with { Levels = [new(2, 2000, 3, 2, 1e-6)] });
        Assert.Equal(StopReason.MaxIterations, r.StopReason);
        Assert.Equal(3, r.Levels[0].Iterations);
    }

    [Fact]
    public void TimeLimitIsReportedAsStopReason()
    {
        var (f, m, _) = Pair.Value;
        var r = Registrar.Register(f, m, Fast with { TimeLimit = TimeSpan.FromTicks(1) });
        Assert.Equal(StopReason.TimeLimit, r.StopReason);
        Assert.Contains(r.Warnings, w => w.Contains("time limit"));
    }

    [Fact]
    public void ResultDoesNotDependOnThreadCount()
    {
        var (f, m, _) = Pair.Value;
        var one = Registrar.Register(f, m, Fast with { MaxThreads = 1 });
        var many = Registrar.Register(f, m, Fast with { MaxThreads = 4 });
        Assert.Equal(one.Transform.ToMatrix4x4(), many.Transform.ToMatrix4x4());
        Assert.Equal(one.MetricAfter, many.MetricAfter);
    }

    [Theory]
    [InlineData(MetricKind.MattesMutualInformation, OptimizerKind.Lbfgs, TransformKind.Rigid)]
    [InlineData(MetricKind.Correlation, OptimizerKind.RegularStepGradientDescent, TransformKind.Rigid)]
    [InlineData(MetricKind.MeanSquares, OptimizerKind.RegularStepGradientDescent, TransformKind.Affine)]
    public void OtherMetricsAndOptimizersAlsoRecoverTheMotion(MetricKind metric, OptimizerKind optimizer, TransformKind transform)
    {
        var (f, m, truth) = Pair.Value;
        var r = Registrar.Register(f, m, Fast with { Metric = metric, Optimizer = optimizer, Transform = transform, CorrectBias = false });
        double tre = RegistrationPhantom.GlandTre(Grid, r.Transform, truth);
        Assert.True(tre < 0.5, $"{metric}/{optimizer}/{transform}: TRE {tre:F3} mm");
        Assert.True(r.MetricAfter < r.MetricBefore);
    }

    [Fact]
    public void AffinePresetRecoversScalingAndReportsProgress()
    {
        var (f, _, _) = Pair.Value;
        var scale = new AffineTransform(Mat3.Diagonal(new Vec3(1.05, 0.96, 1.0)), Vec3.Zero);
        var truth = RegistrationPhantom.Rigid(2, 0, -3, new Vec3(2, 1, -1)).After(
            new AffineTransform(scale.Linear, RegistrationPhantom.GlandCenter - scale.Linear * RegistrationPhantom.GlandCenter));
        var m = RegistrationPhantom.Render(Grid, truth, PhantomContrast.T2w, 0.03, 4);
        var reports = new List<RegistrationProgress>();
        var r = Registrar.Register(f, m, RegistrationOptions.Affine() with { Levels = Fast.Levels }, null, new SyncProgress(reports));
        double tre = RegistrationPhantom.GlandTre(Grid, r.Transform, truth);
        Assert.True(tre < 0.5, $"affine TRE {tre:F3} mm");
        Assert.Equal("affine", r.TransformType);
        Assert.Equal(r.Levels.Sum(l => l.Iterations), reports.Count);
        Assert.All(reports, p => Assert.True(p.Level < p.LevelCount));
    }

    private sealed class SyncProgress(List<RegistrationProgress> sink) : IProgress<RegistrationProgress>
    {
        public void Report(RegistrationProgress value) => sink.Add(value);
    }

    [Fact]
    public void ImplausibleMotionIsFlagged()
    {
        var (f, _, _) = Pair.Value;
        var turned = RegistrationPhantom.Render(Grid, RegistrationPhantom.Rigid(0, 0, 25, Vec3.Zero), PhantomContrast.T2w, 0.03, 3);
        var r = Registrar.Register(f, turned, Fast with { WarnRotationDeg = 5 });
        Assert.Contains(r.Warnings, w => w.Contains("rotation"));
    }

    [Fact]
    public void TransformFileRoundTripsTheMatrix()
    {
        var (f, m, _) = Pair.Value;
        var r = Registrar.Register(f, m, Fast);
        var path = Path.Combine(Path.GetTempPath(), $"serimetry-transform-{Guid.NewGuid():N}.json");
        try
        {
            TransformFile.Write(path, r);
            var back = TransformFile.Read(path);
            Assert.Equal("rigid", back.Type);
            Assert.Equal(r.Transform.ToMatrix4x4(), back.Transform.ToMatrix4x4());
            Assert.Equal(r.MetricAfter, back.MetricAfter);
            File.WriteAllText(path, "{\"type\": \"rigid\"");
            Assert.Throws<InputFormatException>(() => TransformFile.Read(path));
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void SearchRangeBoundsTheCentreDisplacement()
    {
        var (f, m, truth) = Pair.Value;
        var r = Registrar.Register(f, m, Fast with { MaxCenterDisplacementMm = 2 });
        var c = r.CenterOfRotationMm;
        Assert.True((truth.TransformPoint(c) - c).Norm > 4, "the true motion must exceed the range for this check");
        Assert.True((r.Transform.TransformPoint(c) - c).Norm <= 2 + 1e-9);
    }

    [Fact]
    public void UnknownPresetIsAParameterError() =>
        Assert.Throws<InvalidParameterException>(() => RegistrationOptions.ForPreset("elastic"));
}
