namespace Serimetry.Engine.Registration.Optimizers;

/// <summary>
/// A cost function over scaled parameters: writes the gradient into <c>gradient</c> and returns the value
/// (NaN when it cannot be evaluated there).
/// </summary>
internal delegate double Objective(ReadOnlySpan<double> parameters, Span<double> gradient);

/// <summary>Budget and step settings shared by the optimizers; lengths are in scaled-parameter units (≈ mm).</summary>
internal sealed record OptimizerSettings(int MaxIterations, double MaxStep, double MinStep, double Relaxation = 0.5,
    double GradientTolerance = 1e-8, DateTime? DeadlineUtc = null)
{
    public bool TimeUp => DeadlineUtc is { } d && DateTime.UtcNow >= d;
}

/// <summary>The best point found, its value, the iterations used and why the search stopped.</summary>
internal sealed record OptimizerOutcome(double[] Parameters, double Value, int Iterations, StopReason StopReason);
