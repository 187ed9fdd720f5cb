using Serimetry.Engine.Measures;

namespace Serimetry.Engine.Change;

/// <summary>
/// Trend of one measure over all visits (change.json <c>trends[]</c>). On the log scale the slope is the
/// specific growth rate k in 1/year (ln units per year) and gives doubling or halving times; on the
/// linear scale it is in the measure's unit per year (e.g. PSA velocity in ng/mL/yr).
/// </summary>
/// <param name="Measure">Measure id (or <c>psa</c> / <c>psa.velocity</c> for the PSA series).</param>
/// <param name="Unit">Unit of the measure's values.</param>
/// <param name="Scale">Linear or log fit.</param>
/// <param name="SlopeUnit">Unit of <paramref name="SlopePerYear"/>.</param>
/// <param name="SlopePerYear">OLS slope (or two-point slope with two visits).</param>
/// <param name="Ci95">95 % CI of the slope, or null (two visits without a repeatability entry).</param>
/// <param name="DoublingTimeYears">ln2/k for a log-scale trend with k &gt; 0.</param>
/// <param name="HalvingTimeYears">ln2/|k| for a log-scale trend with k &lt; 0.</param>
/// <param name="TimeCi95Years">CI of whichever of the two times is set; the upper end null = unbounded.</param>
/// <param name="NVisits">Number of points fitted.</param>
/// <param name="Method"><c>ols</c> (≥ 3 points, t-quantiles with n−2 df) or <c>two-point</c>.</param>
/// <param name="Flags">Points dropped, unbounded times and the like.</param>
public sealed record MeasureTrend(
    string Measure,
    string Unit,
    TrendScale Scale,
    string SlopeUnit,
    double SlopePerYear,
    double[]? Ci95,
    double? DoublingTimeYears,
    double? HalvingTimeYears,
    double?[]? TimeCi95Years,
    int NVisits,
    string Method,
    IReadOnlyList<string> Flags);
