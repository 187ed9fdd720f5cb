using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// Negative Mattes mutual information (<see cref="ParzenJointHistogram"/>) under a B-spline deformation, for
/// image pairs whose intensities are not the same contrast. Analytic gradient wrt the coefficients:
/// ∂MI/∂c_{d,k} = (1/n) Σ_i ∂MI/∂m_i · ∂m/∂y_d(T(x_i)) · β_k(x_i), using the local support (3x64 coefficients per
/// sample). Pass 1 maps the samples (parallel, per-sample results), the histogram is built in sample order, pass 2
/// accumulates the gradient per fixed partition, merged in partition order: the same result with any thread count.
/// </summary>
internal sealed class BSplineMutualInformation : IBSplineMetric
{
    private const int MinChunk = 512;
    private readonly SampleSet _samples;
    private readonly LinearInterpolator _moving;
    private readonly int _maxThreads;
    private readonly ParzenJointHistogram _histogram;
    private readonly bool[] _valid;
    private readonly double[] _values;
    private readonly Vec3[] _gradients;
    private double[][] _partGradients = [];

    public BSplineMutualInformation(SampleSet samples, LinearInterpolator moving, int maxThreads, int bins,
        (double Min, double Max) fixedRange, (double Min, double Max) movingRange)
    {
        _samples = samples;
        _moving = moving;
        _maxThreads = maxThreads;
        _histogram = new ParzenJointHistogram(bins, fixedRange, movingRange);
        _valid = new bool[samples.Count];
        _values = new double[samples.Count];
        _gradients = new Vec3[samples.Count];
    }

    public string Name => "mattes-mi";

    public int SampleCount => _samples.Count;

    public int ValidCount { get; private set; }

    public double Evaluate(BSplineDeformation t, Span<double> gradient)
    {
        int n = _samples.Count;
        bool want = !gradient.IsEmpty;
        int parts = Math.Max(1, ParallelRange.PartitionCount(n, MinChunk));
        var counts = new int[parts];
        ParallelRange.For(n, MinChunk, (part, start, end) => counts[part] = Map(t, start, end, want), _maxThreads);
        int valid = 0;
        foreach (var c in counts) valid += c;
        ValidCount = valid;
        if (valid < Math.Max(16, n / 20))
        {
            gradient.Clear();
            return double.NaN;
        }
        double mi = _histogram.Build(_samples.FixedValues, _values, _valid, out int used);
        if (want) Gradient(t, gradient, parts, used);
        return -mi;
    }

    private int Map(BSplineDeformation t, int start, int end, bool want)
    {
        Span<int> idx = stackalloc int[BSplineDeformation.SupportSize];
        Span<double> w = stackalloc double[BSplineDeformation.SupportSize];
        var bulk = t.Bulk;
        int count = 0;
        for (int i = start; i < end; i++)
        {
            var x = _samples.Point(i);
            var y = bulk.TransformPoint(x);
            if (t.Support(x, idx, w)) y += t.Sum(idx, w);
            bool ok;
            if (want)
            {
                ok = _moving.TryEvaluate(y, out double m, out Vec3 g);
                _values[i] = m;
                _gradients[i] = g;
            }
            else
            {
                ok = _moving.TryEvaluate(y, out double m);
                _values[i] = m;
            }
            _valid[i] = ok;
            if (ok) count++;
        }
        return count;
    }

    private void Gradient(BSplineDeformation t, Span<double> gradient, int parts, int used)
    {
        int p = t.PointCount * 3, np = t.PointCount;
        if (_partGradients.Length != parts || _partGradients[0].Length != p)
        {
            _partGradients = new double[parts][];
            for (int q = 0; q < parts; q++) _partGradients[q] = new double[p];
        }
        double scale = -1.0 / used; // the metric is −MI
        ParallelRange.For(_samples.Count, MinChunk, (part, start, end) =>
        {
            var g = _partGradients[part];
            Array.Clear(g);
            Span<int> idx = stackalloc int[BSplineDeformation.SupportSize];
            Span<double> w = stackalloc double[BSplineDeformation.SupportSize];
            var f = _samples.FixedValues;
            for (int i = start; i < end; i++)
            {
                if (!_valid[i]) continue;
                double s = _histogram.MovingValueDerivative(f[i], _values[i]);
                if (s == 0 || !t.Support(_samples.Point(i), idx, w)) continue;
                var mg = _gradients[i] * (s * scale);
                for (int k = 0; k < BSplineDeformation.SupportSize; k++)
                {
                    int q = idx[k];
                    if (q < 0) continue;
                    double wk = w[k];
                    g[q] += mg.X * wk; g[np + q] += mg.Y * wk; g[2 * np + q] += mg.Z * wk;
                }
            }
        }, _maxThreads);
        gradient.Clear();
        for (int q = 0; q < parts; q++)
        {
            var g = _partGradients[q];
            for (int k = 0; k < p; k++) gradient[k] += g[k];
        }
    }
}
