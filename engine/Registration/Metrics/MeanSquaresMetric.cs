using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>Mean of squared intensity differences over the overlapping samples (same-contrast images).</summary>
internal sealed class MeanSquaresMetric(SampleSet samples, LinearInterpolator moving, int maxThreads)
    : ImageMetric(samples, moving, maxThreads)
{
    public override string Name => "mean-squares";

    protected override double Reduce(Span<double> gradient, bool wantGradient)
    {
        double sum = 0;
        int p = ParameterCount, n = 0;
        gradient.Clear();
        var f = Samples.FixedValues;
        var dm = wantGradient ? MovingDerivatives : default;
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            double d = MovingValues[i] - f[i];
            sum += d * d;
            n++;
            if (!wantGradient) continue;
            var row = dm.Slice(i * p, p);
            for (int k = 0; k < p; k++) gradient[k] += d * row[k];
        }
        for (int k = 0; k < gradient.Length; k++) gradient[k] *= 2.0 / n;
        return sum / n;
    }
}
