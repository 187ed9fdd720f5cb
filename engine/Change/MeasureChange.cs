using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Change;

/// <summary>Direction of a change judged against measurement noise.</summary>
public enum ChangeDirection
{
    /// <summary>The 95 % band lies entirely above 0.</summary>
    Increase,

    /// <summary>The 95 % band lies entirely below 0.</summary>
    Decrease,

    /// <summary>The 95 % band contains 0: no change beyond measurement noise.</summary>
    Stable,

    /// <summary>No band (no repeatability entry, or values unsuitable for the band's scale).</summary>
    Unknown,
}

/// <summary>
/// Change of one measure between two visits (change.json <c>changes[]</c>). <see cref="Ci95"/> is the
/// 95 % confidence band of the true change on the measure's own scale (docs/change.md).
/// </summary>
/// <param name="Measure">Measure id.</param>
/// <param name="Unit">Unit of baseline, followup, delta and ci95.</param>
/// <param name="FromVisit">Index of the earlier visit.</param>
/// <param name="ToVisit">Index of the later visit.</param>
/// <param name="Baseline">Value at <paramref name="FromVisit"/>.</param>
/// <param name="Followup">Value at <paramref name="ToVisit"/>.</param>
/// <param name="Delta">Followup − baseline.</param>
/// <param name="RelativeDelta">Delta / |baseline| (null when baseline is 0).</param>
/// <param name="Ci95">[low, high] band of the true change, or null when no band could be built.</param>
/// <param name="RepeatabilityCoefficient">RC = 1.96·√2·wSD in the unit (absolute scale) or 1.96·√2·σL on the natural-log scale (log scale).</param>
/// <param name="RepeatabilitySource">Source of the repeatability entry, or null.</param>
/// <param name="ExceedsNoise">Whether the band excludes 0; null without a band.</param>
/// <param name="Direction">Increase, decrease, stable (band contains 0) or unknown (no band).</param>
/// <param name="Scale">Error model used for the band.</param>
/// <param name="RatioCi95">Log scale: the band as a ratio followup/baseline [low, high]; else null.</param>
/// <param name="Flags">Why a band is missing or anything else the reader should know.</param>
public sealed record MeasureChange(
    string Measure,
    string Unit,
    int FromVisit,
    int ToVisit,
    double Baseline,
    double Followup,
    double Delta,
    double? RelativeDelta,
    double[]? Ci95,
    double? RepeatabilityCoefficient,
    string? RepeatabilitySource,
    bool? ExceedsNoise,
    ChangeDirection Direction,
    ErrorScale Scale,
    double[]? RatioCi95,
    IReadOnlyList<string> Flags);
