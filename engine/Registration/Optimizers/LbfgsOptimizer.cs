namespace Serimetry.Engine.Registration.Optimizers;

/// <summary>
/// Limited-memory BFGS (Nocedal &amp; Wright, Numerical Optimization, 2nd ed., algorithm 7.4, two-loop
/// recursion) with a backtracking Armijo line search; each trial step is capped at the maximum step so a
/// poor curvature estimate cannot throw the transform far away.
/// </summary>
internal static class LbfgsOptimizer
{
    private const int Memory = 6;
    private const double Armijo = 1e-4;

    public static OptimizerOutcome Minimize(Objective f, ReadOnlySpan<double> start, OptimizerSettings s,
        Action<int, double>? onIteration = null)
    {
        int n = start.Length;
        var q = start.ToArray();
        var g = new double[n];
        double value = f(q, g);
        if (!double.IsFinite(value)) return new OptimizerOutcome(q, value, 0, StopReason.MetricNotFinite);
        var sHist = new List<double[]>();
        var yHist = new List<double[]>();
        var d = new double[n];
        var trial = new double[n];
        var gTrial = new double[n];
        for (int it = 0; ; it++)
        {
            if (it >= s.MaxIterations) return new(q, value, it, StopReason.MaxIterations);
            if (s.TimeUp) return new(q, value, it, StopReason.TimeLimit);
            double gNorm = RegularStepGradientDescent.Norm(g);
            if (!double.IsFinite(gNorm)) return new(q, value, it, StopReason.MetricNotFinite);
            if (gNorm < s.GradientTolerance) return new(q, value, it, StopReason.Converged);
            Direction(g, sHist, yHist, d);
            double slope = RegularStepGradientDescent.Dot(g, d);
            if (slope >= 0)
            {
                sHist.Clear(); yHist.Clear();
                for (int k = 0; k < n; k++) d[k] = -g[k];
                slope = RegularStepGradientDescent.Dot(g, d);
            }
            double dn = RegularStepGradientDescent.Norm(d);
            double alpha = Math.Min(1.0, s.MaxStep / dn);
            double v;
            while (true)
            {
                for (int k = 0; k < n; k++) trial[k] = q[k] + alpha * d[k];
                v = f(trial, gTrial);
                if (double.IsFinite(v) && v <= value + Armijo * alpha * slope) break;
                alpha *= s.Relaxation;
                if (alpha * dn < s.MinStep) return new(q, value, it, StopReason.StepTooSmall);
            }
            var sk = new double[n];
            var yk = new double[n];
            for (int k = 0; k < n; k++) { sk[k] = trial[k] - q[k]; yk[k] = gTrial[k] - g[k]; }
            if (RegularStepGradientDescent.Dot(sk, yk) > 1e-12)
            {
                if (sHist.Count == Memory) { sHist.RemoveAt(0); yHist.RemoveAt(0); }
                sHist.Add(sk); yHist.Add(yk);
            }
            Array.Copy(trial, q, n);
            Array.Copy(gTrial, g, n);
            value = v;
            onIteration?.Invoke(it + 1, value);
        }
    }

    /// <summary>d = −H·g by the two-loop recursion, H₀ = (sᵀy / yᵀy)·I, or −g / |g| scaled to 1 without history.</summary>
    private static void Direction(double[] g, List<double[]> sHist, List<double[]> yHist, double[] d)
    {
        int n = g.Length, m = sHist.Count;
        Array.Copy(g, d, n);
        Span<double> alpha = stackalloc double[Memory];
        for (int i = m - 1; i >= 0; i--)
        {
            double rho = 1.0 / RegularStepGradientDescent.Dot(yHist[i], sHist[i]);
            alpha[i] = rho * RegularStepGradientDescent.Dot(sHist[i], d);
            for (int k = 0; k < n; k++) d[k] -= alpha[i] * yHist[i][k];
        }
        double gamma = m > 0
            ? RegularStepGradientDescent.Dot(sHist[m - 1], yHist[m - 1]) / RegularStepGradientDescent.Dot(yHist[m - 1], yHist[m - 1])
            : 1.0 / Math.Max(1e-300, RegularStepGradientDescent.Norm(g));
        for (int k = 0; k < n; k++) d[k] *= gamma;
        for (int i = 0; i < m; i++)
        {
            double rho = 1.0 / RegularStepGradientDescent.Dot(yHist[i], sHist[i]);
            double beta = rho * RegularStepGradientDescent.Dot(yHist[i], d);
            for (int k = 0; k < n; k++) d[k] += sHist[i][k] * (alpha[i] - beta);
        }
        for (int k = 0; k < n; k++) d[k] = -d[k];
    }
}
