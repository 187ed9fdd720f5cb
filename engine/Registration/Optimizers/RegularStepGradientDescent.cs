namespace Serimetry.Engine.Registration.Optimizers;

/// <summary>
/// Regular-step gradient descent (as in ITK's optimizer of that name): steps of fixed length along the
/// normalised negative gradient; the length is multiplied by the relaxation factor whenever the gradient
/// turns by more than 90°, and the search stops when it falls below the minimum step.
/// </summary>
internal static class RegularStepGradientDescent
{
    public static OptimizerOutcome Minimize(Objective f, ReadOnlySpan<double> start, OptimizerSettings s,
        Action<int, double>? onIteration = null)
    {
        int n = start.Length;
        var q = start.ToArray();
        var g = new double[n];
        var gPrev = new double[n];
        var trial = new double[n];
        var gTrial = new double[n];
        double value = f(q, g);
        if (!double.IsFinite(value)) return new OptimizerOutcome(q, value, 0, StopReason.MetricNotFinite);
        var best = (double[])q.Clone();
        double bestValue = value, step = s.MaxStep;
        for (int it = 0; ; it++)
        {
            if (it >= s.MaxIterations) return new(best, bestValue, it, StopReason.MaxIterations);
            if (s.TimeUp) return new(best, bestValue, it, StopReason.TimeLimit);
            double norm = Norm(g);
            if (!double.IsFinite(norm)) return new(best, bestValue, it, StopReason.MetricNotFinite);
            if (norm < s.GradientTolerance) return new(best, bestValue, it, StopReason.Converged);
            if (it > 0 && Dot(g, gPrev) < 0) step *= s.Relaxation;
            if (step < s.MinStep) return new(best, bestValue, it, StopReason.StepTooSmall);
            for (int k = 0; k < n; k++) trial[k] = q[k] - step * g[k] / norm;
            double v = f(trial, gTrial);
            if (!double.IsFinite(v))
            {
                step *= s.Relaxation;
                continue;
            }
            Array.Copy(g, gPrev, n);
            Array.Copy(trial, q, n);
            Array.Copy(gTrial, g, n);
            value = v;
            if (value < bestValue)
            {
                bestValue = value;
                Array.Copy(q, best, n);
            }
            onIteration?.Invoke(it + 1, value);
        }
    }

    internal static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        double s = 0;
        for (int i = 0; i < a.Length; i++) s += a[i] * b[i];
        return s;
    }

    internal static double Norm(ReadOnlySpan<double> a) => Math.Sqrt(Dot(a, a));
}
