using Serimetry.Engine.Change;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Reports;

/// <summary>One visit as handed to the report builder.</summary>
/// <param name="Index">0 = baseline, then date order.</param>
/// <param name="Date">Exam date.</param>
/// <param name="StudyInstanceUid">Study Instance UID, or null.</param>
/// <param name="Registration">Alignment record (null = identity, for the baseline).</param>
/// <param name="Values">Measure id → value from <see cref="MeasureRunner"/>.</param>
/// <param name="LesionAdc">Lesion ADC samples for histogram distances, or null.</param>
/// <param name="LesionRefit">Re-fit agreement, or null.</param>
/// <param name="Flags">Notes about the visit.</param>
public sealed record VisitInput(
    int Index,
    DateOnly Date,
    string? StudyInstanceUid,
    RegistrationRecord? Registration,
    IReadOnlyDictionary<string, MeasureValue> Values,
    float[]? LesionAdc = null,
    LesionRefitRecord? LesionRefit = null,
    IReadOnlyList<string>? Flags = null);

/// <summary>Assembles a <see cref="ChangeReport"/> from visits, the change engine and the comparability check.</summary>
public static class ChangeReportBuilder
{
    /// <summary>
    /// Builds the report. <paramref name="problems"/> lists failures of earlier steps (alignment,
    /// propagation); failed measures are added to it, and any problem makes the report partial.
    /// </summary>
    public static ChangeReport Build(
        IReadOnlyList<VisitInput> visits,
        IReadOnlyList<MeasureDescriptor> measures,
        RepeatabilityProfile profile,
        IReadOnlyList<PsaSample>? psa = null,
        IReadOnlyList<VisitAcquisition>? acquisitions = null,
        MeasureSettings? measureSettings = null,
        IReadOnlyList<string>? problems = null,
        IReadOnlyDictionary<string, string>? extraSettings = null)
    {
        var allProblems = new List<string>(problems ?? []);
        foreach (var v in visits)
            foreach (var (id, value) in v.Values.OrderBy(p => p.Key, StringComparer.Ordinal))
                if (value.Status == MeasureStatus.Failed)
                    allProblems.Add($"visit {v.Index}: {id} failed: {value.Reason}");

        var analysis = ChangeEngine.Analyse(
            visits.Select(v => new VisitMeasurements(v.Index, v.Date, v.Values, v.LesionAdc)).ToList(), measures, profile, psa);
        var comparability = acquisitions is null ? [] : ComparabilityChecker.Check(acquisitions);
        var settings = new ReportSettings(profile.Name, (measureSettings ?? MeasureSettings.Default).ShellDistanceMm,
            "Hyndman-Fan type 7 (linear interpolation between order statistics)", extraSettings);

        return new ChangeReport(
            ChangeReportJson.SchemaVersion,
            new SoftwareRecord(SoftwareInfo.Name, SoftwareInfo.Version),
            SoftwareInfo.Caution,
            allProblems.Count > 0,
            allProblems,
            visits.Select(ToRecord).ToList(),
            analysis.Changes,
            analysis.Trends,
            comparability,
            analysis.HistogramDistances,
            settings,
            analysis.Flags);
    }

    private static VisitRecord ToRecord(VisitInput v) => new(
        v.Index,
        v.Date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture),
        v.StudyInstanceUid,
        v.Registration ?? RegistrationRecord.Identity,
        v.Values.ToDictionary(p => p.Key, p => new ValueRecord(p.Value.Value, p.Value.Unit, StatusText(p.Value.Status), p.Value.Reason)),
        v.LesionRefit,
        v.Flags ?? []);

    /// <summary>Status as written in change.json and CSV.</summary>
    public static string StatusText(MeasureStatus s) => s switch
    {
        MeasureStatus.Ok => "ok",
        MeasureStatus.NotApplicable => "notApplicable",
        _ => "failed",
    };
}
