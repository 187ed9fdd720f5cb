using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// A similarity metric between the fixed samples and the moving image seen through a transform; lower
/// is better. One evaluation maps every sample through the transform and interpolates the moving image
/// (in parallel over fixed partitions, writing per-sample results), then the metric reduces the
/// per-sample values in sample order — the result is the same with any thread count.
/// </summary>
internal abstract class ImageMetric
{
    private const int MinChunk = 1024;
    private double[] _dm = [];
    private int _p;

    protected ImageMetric(SampleSet samples, LinearInterpolator moving, int maxThreads)
    {
        Samples = samples;
        Moving = moving;
        MaxThreads = maxThreads;
        Valid = new bool[samples.Count];
        MovingValues = new double[samples.Count];
    }

    public SampleSet Samples { get; }
    public LinearInterpolator Moving { get; }

    /// <summary>When set, samples that map outside this moving-image mask do not count.</summary>
    public MaskLookup? MovingMask { get; init; }
    public int MaxThreads { get; }

    /// <summary>Samples that mapped inside the moving image at the last evaluation.</summary>
    public int ValidCount { get; private set; }

    protected bool[] Valid { get; }
    protected double[] MovingValues { get; }

    /// <summary>∂m/∂p per sample, row i holding the <see cref="ParameterCount"/> derivatives of sample i.</summary>
    protected ReadOnlySpan<double> MovingDerivatives => _dm;

    protected int ParameterCount => _p;

    /// <summary>Short name for reports.</summary>
    public abstract string Name { get; }

    /// <summary>
    /// The metric value at the transform's current parameters; when <paramref name="gradient"/> is not
    /// empty, also its derivative wrt each parameter. NaN when too few samples overlap the moving image.
    /// </summary>
    public double Evaluate(IParametricTransform transform, Span<double> gradient)
    {
        bool wantGradient = !gradient.IsEmpty;
        Map(transform, wantGradient);
        if (ValidCount < Math.Max(16, Samples.Count / 20))
        {
            gradient.Clear();
            return double.NaN;
        }
        return Reduce(gradient, wantGradient);
    }

    /// <summary>Metric-specific reduction over <see cref="Valid"/>, <see cref="MovingValues"/> and (when asked) derivatives.</summary>
    protected abstract double Reduce(Span<double> gradient, bool wantGradient);

    private void Map(IParametricTransform transform, bool wantGradient)
    {
        int n = Samples.Count, p = transform.ParameterCount;
        if (wantGradient && _dm.Length != (long)n * p) _dm = new double[(long)n * p];
        _p = p;
        var affine = transform.ToAffine();
        int partitions = ParallelRange.PartitionCount(n, MinChunk);
        var counts = new int[Math.Max(1, partitions)];
        ParallelRange.For(n, MinChunk, (part, start, end) =>
        {
            int c = 0;
            var s = Samples;
            for (int i = start; i < end; i++)
            {
                var x = new Vec3(s.X[i], s.Y[i], s.Z[i]);
                var y = affine.TransformPoint(x);
                if (MovingMask is not null && !MovingMask.Inside(y))
                {
                    Valid[i] = false;
                    continue;
                }
                bool ok;
                if (wantGradient)
                {
                    ok = Moving.TryEvaluate(y, out double m, out Vec3 g);
                    MovingValues[i] = m;
                    if (ok) transform.ProjectGradient(x, g, _dm.AsSpan(i * p, p));
                }
                else
                {
                    ok = Moving.TryEvaluate(y, out double m);
                    MovingValues[i] = m;
                }
                Valid[i] = ok;
                if (ok) c++;
            }
            counts[part] = c;
        }, MaxThreads);
        int total = 0;
        foreach (var c in counts) total += c;
        ValidCount = total;
    }
}
