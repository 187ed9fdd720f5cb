using Serimetry.Engine.Change;

namespace Serimetry.Engine.Reports;

/// <summary>
/// The whole result of a comparison, serialised as <c>change.json</c> (ARCHITECTURE.md minimum plus
/// extensions; JSON Schema in schemas/change.schema.json). <see cref="Partial"/> is true whenever a step or
/// measure failed, so a partial result never looks complete.
/// </summary>
/// <param name="SchemaVersion">Version of the change.json schema (<see cref="ChangeReportJson.SchemaVersion"/>).</param>
/// <param name="Software">Name and version of the software that wrote it.</param>
/// <param name="Caution">The decision-support caution.</param>
/// <param name="Partial">True when something failed and the report is incomplete.</param>
/// <param name="Problems">What failed, in plain words (no patient identifiers).</param>
/// <param name="Visits">Per-visit alignment and values, baseline first.</param>
/// <param name="Changes">Changes vs the baseline and vs the previous visit.</param>
/// <param name="Trends">Trends over all visits, including PSA kinetics.</param>
/// <param name="Comparability">Acquisition differences that threaten comparability.</param>
/// <param name="HistogramDistances">Lesion ADC distribution distances between visits.</param>
/// <param name="Settings">Parameters used (repeatability profile, shell distance, definitions).</param>
/// <param name="Flags">Further notes from the change engine.</param>
public sealed record ChangeReport(
    string SchemaVersion,
    SoftwareRecord Software,
    string Caution,
    bool Partial,
    IReadOnlyList<string> Problems,
    IReadOnlyList<VisitRecord> Visits,
    IReadOnlyList<MeasureChange> Changes,
    IReadOnlyList<MeasureTrend> Trends,
    IReadOnlyList<ComparabilityItem> Comparability,
    IReadOnlyList<HistogramDistance> HistogramDistances,
    ReportSettings Settings,
    IReadOnlyList<string> Flags);

/// <summary>Software name and version.</summary>
public sealed record SoftwareRecord(string Name, string Version);

/// <summary>Parameters recorded so a result can be repeated.</summary>
/// <param name="RepeatabilityProfile">Name of the repeatability profile used for the bands.</param>
/// <param name="ShellDistanceMm">Peri-lesional shell width of the conspicuity measures.</param>
/// <param name="PercentileDefinition">Percentile definition of the ADC statistics.</param>
/// <param name="Extra">Other parameters (registration presets, seeds …) as text.</param>
public sealed record ReportSettings(string RepeatabilityProfile, double ShellDistanceMm, string PercentileDefinition,
    IReadOnlyDictionary<string, string>? Extra = null);
