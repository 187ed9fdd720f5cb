using Serimetry.Engine.Registration.Interpolation;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// Negative mutual information estimated with Parzen windows as in Mattes et al., "PET-CT image
/// registration in the chest using free-form deformations", IEEE TMI 22(1), 2003: a zero-order (box)
/// window on fixed intensities and a cubic B-spline window on moving intensities, so the joint histogram
/// is differentiable in the moving value. The derivative uses the identity
/// ∂MI/∂p = Σ ∂p(ι,κ)/∂p · log(p(ι,κ) / (p_F(ι) p_M(κ))) (the marginal terms cancel), evaluated in a second
/// pass over cached per-sample derivatives, so no bins×bins×parameters array is needed.
/// </summary>
internal sealed class MattesMutualInformationMetric : ImageMetric
{
    private const int Padding = 2;
    private readonly int _bins;
    private readonly double _fMin, _fBin, _mMin, _mBin;
    private readonly double[] _joint;
    private readonly double[] _weights;
    private readonly double[] _pf;
    private readonly double[] _pm;

    public MattesMutualInformationMetric(SampleSet samples, LinearInterpolator moving, int maxThreads, int bins,
        (double Min, double Max) fixedRange, (double Min, double Max) movingRange)
        : base(samples, moving, maxThreads)
    {
        if (bins < 8) throw new ArgumentOutOfRangeException(nameof(bins), "Mattes MI needs at least 8 bins.");
        _bins = bins;
        _fMin = fixedRange.Min;
        _fBin = Math.Max(1e-12, (fixedRange.Max - fixedRange.Min) / (bins - 2 * Padding));
        _mMin = movingRange.Min;
        _mBin = Math.Max(1e-12, (movingRange.Max - movingRange.Min) / (bins - 2 * Padding));
        _joint = new double[bins * bins];
        _weights = new double[bins * bins];
        _pf = new double[bins];
        _pm = new double[bins];
    }

    public override string Name => "mattes-mi";

    public int Bins => _bins;

    protected override double Reduce(Span<double> gradient, bool wantGradient)
    {
        int b = _bins;
        Array.Clear(_joint);
        var f = Samples.FixedValues;
        int n = 0;
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            int row = FixedBin(f[i]) * b;
            double mc = MovingContinuousBin(MovingValues[i]);
            int k0 = (int)Math.Floor(mc) - 1;
            for (int k = k0; k < k0 + 4; k++) _joint[row + k] += CubicBSpline(k - mc);
            n++;
        }
        double mi = Entropies(n);
        if (wantGradient) Gradient(gradient, n);
        return -mi;
    }

    /// <summary>Normalises the joint histogram, fills the log-ratio weights and returns MI (nats).</summary>
    private double Entropies(int n)
    {
        int b = _bins;
        double inv = 1.0 / n;
        Array.Clear(_pf);
        Array.Clear(_pm);
        for (int r = 0; r < b; r++)
            for (int k = 0; k < b; k++)
            {
                double v = _joint[r * b + k] * inv;
                _joint[r * b + k] = v;
                _pf[r] += v;
                _pm[k] += v;
            }
        double mi = 0;
        for (int r = 0; r < b; r++)
            for (int k = 0; k < b; k++)
            {
                double v = _joint[r * b + k];
                double w = v > 1e-16 && _pf[r] > 0 && _pm[k] > 0 ? Math.Log(v / (_pf[r] * _pm[k])) : 0;
                _weights[r * b + k] = w;
                mi += v * w;
            }
        return mi;
    }

    private void Gradient(Span<double> gradient, int n)
    {
        int p = ParameterCount, b = _bins;
        gradient.Clear();
        var f = Samples.FixedValues;
        var dm = MovingDerivatives;
        double scale = 1.0 / (n * _mBin);
        for (int i = 0; i < Samples.Count; i++)
        {
            if (!Valid[i]) continue;
            int row = FixedBin(f[i]) * b;
            double mc = MovingContinuousBin(MovingValues[i]);
            int k0 = (int)Math.Floor(mc) - 1;
            double s = 0;
            // ∂β3(κ − mc)/∂m = −β3'(κ − mc) / binWidth
            for (int k = k0; k < k0 + 4; k++) s -= _weights[row + k] * CubicBSplineDerivative(k - mc);
            if (s == 0) continue;
            var d = dm.Slice(i * p, p);
            for (int q = 0; q < p; q++) gradient[q] += s * d[q];
        }
        // The metric is −MI.
        for (int q = 0; q < p; q++) gradient[q] *= -scale;
    }

    private int FixedBin(double v)
    {
        int i = (int)((v - _fMin) / _fBin + Padding);
        return Math.Clamp(i, Padding, _bins - Padding - 1);
    }

    private double MovingContinuousBin(double v) =>
        Math.Clamp((v - _mMin) / _mBin + Padding, Padding, _bins - Padding - 1);

    /// <summary>Cubic B-spline β3(u), support |u| &lt; 2.</summary>
    internal static double CubicBSpline(double u)
    {
        u = Math.Abs(u);
        if (u < 1) return (4 - 6 * u * u + 3 * u * u * u) / 6;
        if (u < 2) { double t = 2 - u; return t * t * t / 6; }
        return 0;
    }

    /// <summary>dβ3/du.</summary>
    internal static double CubicBSplineDerivative(double u)
    {
        double a = Math.Abs(u), s = Math.Sign(u);
        if (a < 1) return s * (-2 * a + 1.5 * a * a);
        if (a < 2) { double t = 2 - a; return -s * 0.5 * t * t; }
        return 0;
    }
}
