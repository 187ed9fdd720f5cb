using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// Mean squared difference between the fixed samples and the gain-matched moving image under a B-spline
/// deformation, divided by the fixed samples' variance (dimensionless: 0 for a perfect match, about 2 for
/// unrelated images). The moving gain g = mean(fixed) / mean(moving at the starting transform) is fixed
/// once, so follow-up series scaled differently by the scanner still compare. The gradient uses the local
/// support of the B-spline: each sample touches 3x64 coefficients, accumulated per partition and merged in
/// partition order (the same result with any thread count).
/// </summary>
internal sealed class BSplineMeanSquares : IBSplineMetric
{
    private const int MinChunk = 512;
    private readonly SampleSet _samples;
    private readonly LinearInterpolator _moving;
    private readonly int _maxThreads;
    private readonly double _invVar;
    private double[][] _partGradients = [];

    public BSplineMeanSquares(SampleSet samples, LinearInterpolator moving, int maxThreads, BSplineDeformation start)
    {
        _samples = samples;
        _moving = moving;
        _maxThreads = maxThreads;
        double sf = 0, sf2 = 0, sm = 0;
        int nm = 0;
        for (int i = 0; i < samples.Count; i++)
        {
            double f = samples.FixedValues[i];
            sf += f; sf2 += f * f;
            if (moving.TryEvaluate(start.TransformPoint(samples.Point(i)), out double m)) { sm += m; nm++; }
        }
        double meanF = sf / samples.Count;
        double var = Math.Max(1e-12, sf2 / samples.Count - meanF * meanF);
        _invVar = 1 / var;
        Gain = nm > 0 && sm > 0 ? meanF / (sm / nm) : 1;
    }

    public string Name => "normalized-mean-squares";

    /// <summary>The factor applied to moving intensities.</summary>
    public double Gain { get; }

    /// <summary>Samples that mapped inside the moving image at the last evaluation.</summary>
    public int ValidCount { get; private set; }

    public int SampleCount => _samples.Count;

    /// <summary>The metric; writes its gradient wrt the coefficients when <paramref name="gradient"/> is not empty. NaN when too few samples overlap.</summary>
    public double Evaluate(BSplineDeformation t, Span<double> gradient)
    {
        int n = _samples.Count, p = t.PointCount * 3;
        bool want = !gradient.IsEmpty;
        int parts = Math.Max(1, ParallelRange.PartitionCount(n, MinChunk));
        if (want && (_partGradients.Length != parts || _partGradients[0].Length != p))
        {
            _partGradients = new double[parts][];
            for (int q = 0; q < parts; q++) _partGradients[q] = new double[p];
        }
        var sums = new double[parts];
        var counts = new int[parts];
        ParallelRange.For(n, MinChunk, (part, start, end) =>
        {
            var g = want ? _partGradients[part] : null;
            if (g is not null) Array.Clear(g);
            (sums[part], counts[part]) = Partition(t, start, end, g);
        }, _maxThreads);
        double sum = 0;
        int valid = 0;
        for (int q = 0; q < parts; q++) { sum += sums[q]; valid += counts[q]; }
        ValidCount = valid;
        if (valid < Math.Max(16, n / 20))
        {
            gradient.Clear();
            return double.NaN;
        }
        double scale = _invVar / valid;
        if (want)
        {
            gradient.Clear();
            for (int q = 0; q < parts; q++)
            {
                var g = _partGradients[q];
                for (int k = 0; k < p; k++) gradient[k] += g[k];
            }
            for (int k = 0; k < p; k++) gradient[k] *= scale;
        }
        return sum * scale;
    }

    private (double Sum, int Count) Partition(BSplineDeformation t, int start, int end, double[]? g)
    {
        Span<int> idx = stackalloc int[BSplineDeformation.SupportSize];
        Span<double> w = stackalloc double[BSplineDeformation.SupportSize];
        int np = t.PointCount;
        double sum = 0, gain = Gain;
        int count = 0;
        var bulk = t.Bulk;
        for (int i = start; i < end; i++)
        {
            var x = _samples.Point(i);
            bool supported = t.Support(x, idx, w);
            var y = bulk.TransformPoint(x);
            if (supported) y += t.Sum(idx, w);
            double m;
            Vec3 mg = default;
            bool ok = g is null ? _moving.TryEvaluate(y, out m) : _moving.TryEvaluate(y, out m, out mg);
            if (!ok) continue;
            double r = gain * m - _samples.FixedValues[i];
            sum += r * r;
            count++;
            if (g is null || !supported) continue;
            double a = 2 * r * gain;
            double gx = a * mg.X, gy = a * mg.Y, gz = a * mg.Z;
            for (int k = 0; k < BSplineDeformation.SupportSize; k++)
            {
                int q = idx[k];
                if (q < 0) continue;
                double wk = w[k];
                g[q] += gx * wk; g[np + q] += gy * wk; g[2 * np + q] += gz * wk;
            }
        }
        return (sum, count);
    }
}
