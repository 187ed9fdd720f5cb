using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// Negative mutual information estimated with Parzen windows as in Mattes et al., "PET-CT image
/// registration in the chest using free-form deformations", IEEE TMI 22(1), 2003 (histogram and derivative in
/// <see cref="ParzenJointHistogram"/>); the derivative is evaluated in a second pass over cached per-sample
/// derivatives ∂m/∂p.
/// </summary>
internal sealed class MattesMutualInformationMetric : ImageMetric
{
    private readonly ParzenJointHistogram _histogram;

    public MattesMutualInformationMetric(SampleSet samples, LinearInterpolator moving, int maxThreads, int bins,
        (double Min, double Max) fixedRange, (double Min, double Max) movingRange)
        : base(samples, moving, maxThreads)
    {
        _histogram = new ParzenJointHistogram(bins, fixedRange, movingRange);
    }

    public override string Name => "mattes-mi";

    public int Bins => _histogram.Bins;

    protected override double Reduce(Span<double> gradient, bool wantGradient)
    {
        double mi = _histogram.Build(Samples.FixedValues, MovingValues, Valid, out int n);
        if (wantGradient) Gradient(gradient, n);
        return -mi;
    }

    private void Gradient(Span<double> gradient, int n)
    {
        int p = ParameterCount;
        gradient.Clear();
        var f = Samples.FixedValues;
        var dm = MovingDerivatives;
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            double s = _histogram.MovingValueDerivative(f[i], MovingValues[i]);
            if (s == 0) continue;
            var d = dm.Slice(i * p, p);
            for (int q = 0; q < p; q++) gradient[q] += s * d[q];
        }
        // The metric is −MI.
        for (int q = 0; q < p; q++) gradient[q] *= -1.0 / n;
    }
}
