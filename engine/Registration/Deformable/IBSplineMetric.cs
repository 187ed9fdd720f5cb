using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>A similarity metric of the B-spline stage (lower is better) with its gradient wrt the coefficients.</summary>
internal interface IBSplineMetric
{
    /// <summary>Short name for reports.</summary>
    string Name { get; }

    int SampleCount { get; }

    /// <summary>Samples that mapped inside the moving image at the last evaluation.</summary>
    int ValidCount { get; }

    /// <summary>The metric; writes its gradient wrt the coefficients when <paramref name="gradient"/> is not empty. NaN when too few samples overlap.</summary>
    double Evaluate(BSplineDeformation t, Span<double> gradient);
}
