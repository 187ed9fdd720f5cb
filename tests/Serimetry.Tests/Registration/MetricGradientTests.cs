using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Transforms;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Registration;

/// <summary>
/// Analytic metric gradients against central finite differences of the metric itself (common practice
/// for checking derivative code), and metrics optimal at the true alignment.
/// </summary>
public class MetricGradientTests(ITestOutputHelper output)
{
    private static readonly Lazy<(Volume<float> F, Volume<float> M, Volume<byte> Mask)> Images = new(() =>
    {
        var grid = RegistrationPhantom.T2Grid(64, 64, 24, 1.5, 3);
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 1);
        var m = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 2);
        return (f, m, MaskOps.DilateBox(RegistrationPhantom.GlandMask(grid), 10));
    });

    internal static ImageMetric Create(MetricKind kind, Volume<float> f, Volume<float> m, Volume<byte>? mask, int samples)
    {
        var set = SampleSet.Draw(f, mask, samples, 7);
        var interp = new LinearInterpolator(m);
        return kind switch
        {
            MetricKind.MattesMutualInformation => new MattesMutualInformationMetric(set, interp, -1, 32, (0, 1.2), (0, 1.2)),
            MetricKind.Correlation => new CorrelationMetric(set, interp, -1),
            _ => new MeanSquaresMetric(set, interp, -1),
        };
    }

    [Theory]
    [InlineData(MetricKind.MeanSquares, TransformKind.Rigid)]
    [InlineData(MetricKind.Correlation, TransformKind.Rigid)]
    [InlineData(MetricKind.MattesMutualInformation, TransformKind.Rigid)]
    [InlineData(MetricKind.MattesMutualInformation, TransformKind.Affine)]
    [InlineData(MetricKind.Correlation, TransformKind.Translation)]
    public void AnalyticGradientMatchesFiniteDifferences(MetricKind metricKind, TransformKind transformKind)
    {
        var (f, m, mask) = Images.Value;
        var metric = Create(metricKind, f, m, mask, 3000);
        var t = TransformFactory.Create(transformKind, RegistrationPhantom.GlandCenter, new Vec3(1.3, -0.7, 0.9));
        int p = t.ParameterCount;
        var p0 = new double[p];
        t.GetParameters(p0);
        if (transformKind == TransformKind.Rigid) { p0[0] = 0.03; p0[1] = -0.02; p0[2] = 0.04; }
        t.SetParameters(p0);
        var scales = TransformFactory.EstimateScales(t, metric.Samples);
        var grad = new double[p];
        metric.Evaluate(t, grad);
        for (int k = 0; k < p; k++)
        {
            double h = 0.001 / scales[k]; // ~0.001 mm of motion: the sampled metric is piecewise smooth, so keep h tiny
            var q = (double[])p0.Clone();
            q[k] = p0[k] + h; t.SetParameters(q);
            double up = metric.Evaluate(t, default);
            q[k] = p0[k] - h; t.SetParameters(q);
            double down = metric.Evaluate(t, default);
            double fd = (up - down) / (2 * h);
            output.WriteLine($"{t.ParameterNames[k]}: analytic {grad[k]:G5}, finite difference {fd:G5}");
            // Finite differences of a sampled metric jump where samples change interpolation cell or leave the image.
            double tol = 0.05 * Math.Abs(fd) + 1e-3 * MaxAbs(grad);
            Assert.True(Math.Abs(grad[k] - fd) <= tol, $"{t.ParameterNames[k]}: analytic {grad[k]:G5} vs FD {fd:G5}");
        }
    }

    [Theory]
    [InlineData(MetricKind.MeanSquares)]
    [InlineData(MetricKind.Correlation)]
    [InlineData(MetricKind.MattesMutualInformation)]
    public void MetricIsOptimalAtTrueAlignment(MetricKind kind)
    {
        // The two renderings differ only by noise, so identity is the truth.
        var (f, m, mask) = Images.Value;
        var metric = Create(kind, f, m, mask, 5000);
        var t = TransformFactory.Create(TransformKind.Rigid, RegistrationPhantom.GlandCenter, Vec3.Zero);
        double atTruth = metric.Evaluate(t, default);
        double[][] moves =
        [
            [0.02, 0, 0, 0, 0, 0], [0, -0.02, 0, 0, 0, 0], [0, 0, 0.02, 0, 0, 0],
            [0, 0, 0, 1, 0, 0], [0, 0, 0, 0, -1, 0], [0, 0, 0, 0, 0, 1],
        ];
        foreach (var p in moves)
        {
            t.SetParameters(p);
            double v = metric.Evaluate(t, default);
            Assert.True(v > atTruth, $"{kind}: {v:G6} at [{string.Join(", ", p)}] is not worse than {atTruth:G6} at the truth");
        }
    }

    private static double MaxAbs(double[] v) => v.Max(Math.Abs);
}
