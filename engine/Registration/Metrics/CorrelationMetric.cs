using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// Negative normalized cross-correlation −Σ f̃·m̃ / √(Σ f̃² Σ m̃²) with means removed over the overlapping
/// samples (−1 is a perfect linear match). Insensitive to gain and offset, so robust to contrast scaling.
/// </summary>
internal sealed class CorrelationMetric(SampleSet samples, LinearInterpolator moving, int maxThreads)
    : ImageMetric(samples, moving, maxThreads)
{
    public override string Name => "correlation";

    protected override double Reduce(Span<double> gradient, bool wantGradient)
    {
        var f = Samples.FixedValues;
        double sf = 0, sm = 0, sff = 0, smm = 0, sfm = 0;
        int n = 0;
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            double fv = f[i], mv = MovingValues[i];
            sf += fv; sm += mv; sff += fv * fv; smm += mv * mv; sfm += fv * mv;
            n++;
        }
        double fBar = sf / n, mBar = sm / n;
        double cff = sff - n * fBar * fBar, cmm = smm - n * mBar * mBar, cfm = sfm - n * fBar * mBar;
        if (cff <= 0 || cmm <= 0)
        {
            gradient.Clear();
            return 0;
        }
        double denom = Math.Sqrt(cff * cmm);
        double ncc = cfm / denom;
        if (wantGradient) Gradient(gradient, fBar, mBar, cfm, cmm, denom);
        return -ncc;
    }

    private void Gradient(Span<double> gradient, double fBar, double mBar, double cfm, double cmm, double denom)
    {
        int p = ParameterCount;
        Span<double> dFm = stackalloc double[p];
        Span<double> dMm = stackalloc double[p];
        dFm.Clear(); dMm.Clear();
        var f = Samples.FixedValues;
        var dm = MovingDerivatives;
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            double wf = f[i] - fBar, wm = MovingValues[i] - mBar;
            var row = dm.Slice(i * p, p);
            for (int k = 0; k < p; k++)
            {
                dFm[k] += wf * row[k];
                dMm[k] += wm * row[k];
            }
        }
        // d(cfm)/dp = Σ (f − f̄) ∂m/∂p ; d(cmm)/dp = 2 Σ (m − m̄) ∂m/∂p
        for (int k = 0; k < p; k++)
            gradient[k] = -(dFm[k] / denom - cfm * dMm[k] / (denom * cmm));
    }
}
