namespace Serimetry.Engine.Registration.Optimizers;

/// <summary>Why an optimisation ended; always returned as data, never thrown.</summary>
public enum StopReason
{
    /// <summary>The gradient magnitude fell below its tolerance.</summary>
    Converged,

    /// <summary>The step length fell below its minimum (the usual end of regular-step descent).</summary>
    StepTooSmall,

    /// <summary>The iteration budget ran out first.</summary>
    MaxIterations,

    /// <summary>The wall-time budget ran out first.</summary>
    TimeLimit,

    /// <summary>The metric could not be evaluated (too few samples overlap the moving image).</summary>
    MetricNotFinite,
}
