using Serimetry.Engine.Registration.Optimizers;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>Optimizers on an analytic function with a known minimum (common practice for optimizer checks).</summary>
public class OptimizerTests
{
    // f(x, y) = (x − 3)² + 10 (y + 1)²: minimum 0 at (3, −1).
    private static double Bowl(ReadOnlySpan<double> p, Span<double> g)
    {
        g[0] = 2 * (p[0] - 3);
        g[1] = 20 * (p[1] + 1);
        return (p[0] - 3) * (p[0] - 3) + 10 * (p[1] + 1) * (p[1] + 1);
    }

    [Fact]
    public void RegularStepDescentFindsTheMinimum()
    {
        var r = RegularStepGradientDescent.Minimize(Bowl, [0, 0], new OptimizerSettings(500, 1, 1e-6));
        Assert.Equal(3, r.Parameters[0], 3);
        Assert.Equal(-1, r.Parameters[1], 3);
        Assert.Equal(StopReason.StepTooSmall, r.StopReason);
    }

    [Fact]
    public void LbfgsFindsTheMinimumInFewIterations()
    {
        var r = LbfgsOptimizer.Minimize(Bowl, [0, 0], new OptimizerSettings(100, 10, 1e-9, GradientTolerance: 1e-8));
        Assert.Equal(3, r.Parameters[0], 6);
        Assert.Equal(-1, r.Parameters[1], 6);
        Assert.True(r.Iterations < 20, $"{r.Iterations} iterations");
    }

    [Fact]
    public void NonFiniteMetricStopsWithAReasonInsteadOfLooping()
    {
        static double Broken(ReadOnlySpan<double> p, Span<double> g) { g[0] = double.NaN; return p[0]; }
        Assert.Equal(StopReason.MetricNotFinite, RegularStepGradientDescent.Minimize(Broken, [1.0], new OptimizerSettings(100, 1, 1e-3)).StopReason);
        Assert.Equal(StopReason.MetricNotFinite, LbfgsOptimizer.Minimize(Broken, [1.0], new OptimizerSettings(100, 1, 1e-3)).StopReason);
    }
}
