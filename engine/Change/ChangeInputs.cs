using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Change;

/// <summary>What the change engine needs to know about a measure (taken from its <see cref="IMeasure"/>).</summary>
public sealed record MeasureDescriptor(string Id, string Unit, ErrorScale ErrorScale, string RepeatabilityId, TrendScale TrendScale)
{
    /// <summary>The descriptor of a measure plugin.</summary>
    public static MeasureDescriptor From(IMeasure m) => new(m.Id, m.Unit, m.ErrorScale, m.RepeatabilityId, m.TrendScale);
}

/// <summary>One visit's measured values, in baseline space.</summary>
/// <param name="Index">0 = baseline, then 1, 2 … in date order.</param>
/// <param name="Date">Exam date.</param>
/// <param name="Values">Measure id → value.</param>
/// <param name="LesionAdc">The lesion's finite ADC samples for histogram distances, or null.</param>
public sealed record VisitMeasurements(int Index, DateOnly Date, IReadOnlyDictionary<string, MeasureValue> Values, float[]? LesionAdc = null);

/// <summary>Distance between the lesion ADC distributions of two visits (change.json extension <c>histogramDistances[]</c>).</summary>
public sealed record HistogramDistance(string Measure, string Unit, int FromVisit, int ToVisit, double Wasserstein1, double KolmogorovSmirnov,
    int BaselineSamples, int FollowupSamples);

/// <summary>Everything the change engine computed.</summary>
public sealed record ChangeAnalysis(
    IReadOnlyList<MeasureChange> Changes,
    IReadOnlyList<MeasureTrend> Trends,
    IReadOnlyList<HistogramDistance> HistogramDistances,
    IReadOnlyList<string> Flags);
