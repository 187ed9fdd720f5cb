using System.Globalization;

namespace Serimetry.Engine.Radiomics.Series;

/// <summary>
/// Delta features between visits and a tidy long-format time series across visits (one row per visit, region,
/// image and feature value) for research export. Features are matched by family, IBSI code, aggregation and name.
/// </summary>
public static class RadiomicsTimeSeries
{
    public const string LongHeader = "visit,date,region,image,family,feature,ibsiCode,aggregationCode,value,robust";
    public const string DeltaHeader = "region,image,family,feature,ibsiCode,aggregationCode,baseline,followUp,delta,relativeDelta";

    /// <summary>A stable identity of a feature value (family, IBSI code, aggregation, name) for matching and filtering.</summary>
    public static string KeyOf(FeatureValue f) => $"{f.Family}|{f.IbsiCode}|{f.AggregationCode}|{f.Feature}";

    /// <summary>
    /// Follow-up minus baseline for every feature present in both (same region and image required); when
    /// <paramref name="keep"/> is given (keys from <see cref="KeyOf"/>, e.g. the robust features), only those.
    /// </summary>
    public static IReadOnlyList<FeatureDelta> Deltas(VisitFeatures baseline, VisitFeatures followUp, IReadOnlySet<string>? keep = null)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(followUp);
        if (!string.Equals(baseline.Region, followUp.Region, StringComparison.Ordinal) || !string.Equals(baseline.Image, followUp.Image, StringComparison.Ordinal))
            throw new ArgumentException($"regions differ: '{baseline.Region}/{baseline.Image}' vs '{followUp.Region}/{followUp.Image}'", nameof(followUp));
        var later = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var f in followUp.Features) later[KeyOf(f)] = f.Value;
        var result = new List<FeatureDelta>();
        foreach (var f in baseline.Features)
        {
            var key = KeyOf(f);
            if (keep is not null && !keep.Contains(key)) continue;
            if (!later.TryGetValue(key, out double v)) continue;
            double delta = v - f.Value;
            double relative = double.IsFinite(f.Value) && f.Value != 0 ? delta / Math.Abs(f.Value) : double.NaN;
            result.Add(new FeatureDelta(baseline.Region, f.Family, f.Feature, f.IbsiCode, f.AggregationCode, f.Value, v, delta, relative, baseline.Image));
        }
        return result;
    }

    /// <summary>
    /// Writes the long-format series; NaN as an empty cell, dates as ISO 8601. <paramref name="robust"/> gives each
    /// row's robust flag (<c>true</c>/<c>false</c>), or null for an empty cell (no robustness data: unfiltered).
    /// </summary>
    public static void WriteLong(TextWriter writer, IEnumerable<VisitFeatures> visits, Func<VisitFeatures, FeatureValue, bool?>? robust = null)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(visits);
        writer.Write(LongHeader + "\n");
        foreach (var visit in visits)
        foreach (var f in visit.Features)
        {
            string flag = robust?.Invoke(visit, f) switch { true => "true", false => "false", null => "" };
            writer.Write(string.Join(',', RadiomicsCsv.Field(visit.VisitId), visit.Date?.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture) ?? "",
                RadiomicsCsv.Field(visit.Region), RadiomicsCsv.Field(visit.Image), RadiomicsCsv.Field(f.Family), RadiomicsCsv.Field(f.Feature),
                RadiomicsCsv.Field(f.IbsiCode), RadiomicsCsv.Field(f.AggregationCode), RadiomicsCsv.Number(f.Value), flag));
            writer.Write('\n');
        }
    }

    /// <summary>Writes deltas as CSV with <see cref="DeltaHeader"/>.</summary>
    public static void WriteDeltas(TextWriter writer, IEnumerable<FeatureDelta> deltas)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(deltas);
        writer.Write(DeltaHeader + "\n");
        foreach (var d in deltas)
        {
            writer.Write(string.Join(',', RadiomicsCsv.Field(d.Region), RadiomicsCsv.Field(d.Image), RadiomicsCsv.Field(d.Family),
                RadiomicsCsv.Field(d.Feature), RadiomicsCsv.Field(d.IbsiCode), RadiomicsCsv.Field(d.AggregationCode),
                RadiomicsCsv.Number(d.Baseline), RadiomicsCsv.Number(d.FollowUp), RadiomicsCsv.Number(d.Delta), RadiomicsCsv.Number(d.RelativeDelta)));
            writer.Write('\n');
        }
    }
}
