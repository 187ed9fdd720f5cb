namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// The Parzen-window joint histogram of Mattes et al. (IEEE TMI 22(1), 2003): a zero-order (box) window on fixed
/// intensities, a cubic B-spline window on moving intensities (differentiable in the moving value), two bins of
/// padding. After <see cref="Build"/> it holds log(p(ι,κ)/(p_F(ι)·p_M(κ))) per bin, from which
/// <see cref="MovingValueDerivative"/> gives ∂MI/∂m for one sample: ∂MI/∂p = Σ_samples ∂MI/∂m · ∂m/∂p (the
/// marginal terms cancel), so no bins×bins×parameters array is needed. Shared by the linear-transform and
/// B-spline metrics.
/// </summary>
internal sealed class ParzenJointHistogram
{
    private const int Padding = 2;
    private readonly int _bins;
    private readonly double _fMin, _fBin, _mMin, _mBin;
    private readonly double[] _joint;
    private readonly double[] _weights;
    private readonly double[] _pf;
    private readonly double[] _pm;

    public ParzenJointHistogram(int bins, (double Min, double Max) fixedRange, (double Min, double Max) movingRange)
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

    public int Bins => _bins;

    /// <summary>Fills the histogram from the valid samples (in sample order) and returns MI (nats); <paramref name="n"/> = valid samples.</summary>
    public double Build(ReadOnlySpan<float> fixedValues, ReadOnlySpan<double> movingValues, ReadOnlySpan<bool> valid, out int n)
    {
        int b = _bins;
        Array.Clear(_joint);
        n = 0;
        for (int i = 0; i < fixedValues.Length; i++)
        {
            if (!valid[i]) continue;
            int row = FixedBin(fixedValues[i]) * b;
            double mc = MovingContinuousBin(movingValues[i]);
            int k0 = (int)Math.Floor(mc) - 1;
            for (int k = k0; k < k0 + 4; k++) _joint[row + k] += CubicBSpline(k - mc);
            n++;
        }
        return n == 0 ? 0 : Entropies(n);
    }

    /// <summary>
    /// ∂MI/∂m of one sample times n (the valid count of <see cref="Build"/>): divide the accumulated sum by n.
    /// </summary>
    public double MovingValueDerivative(double fixedValue, double movingValue)
    {
        int row = FixedBin(fixedValue) * _bins;
        double mc = MovingContinuousBin(movingValue);
        int k0 = (int)Math.Floor(mc) - 1;
        double s = 0;
        // ∂β3(κ − mc)/∂m = −β3'(κ − mc) / binWidth
        for (int k = k0; k < k0 + 4; k++) s -= _weights[row + k] * CubicBSplineDerivative(k - mc);
        return s / _mBin;
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
