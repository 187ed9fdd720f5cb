using System.Globalization;

namespace Serimetry.Engine.Radiomics.Series;

/// <summary>
/// Delta features between visits and a tidy long-format time series across visits (one row per visit, region
/// and feature value) for research export. Features are matched by family, IBSI code, aggregation and name.
/// </summary>
public static class RadiomicsTimeSeries
{
    public const string LongHeader = "visit,date,region,family,feature,ibsiCode,aggregationCode,value";
    public const string DeltaHeader = "region,family,feature,ibsiCode,aggregationCode,baseline,followUp,delta,relativeDelta";

    /// <summary>A stable identity of a feature value (family, IBSI code, aggregation, name) for matching and filtering.</summary>
    public static string KeyOf(FeatureValue f) => $"{f.Family}|{f.IbsiCode}|{f.AggregationCode}|{f.Feature}";

    /// <summary>
    /// Follow-up minus baseline for every feature present in both (same region required); when
    /// <paramref name="keep"/> is given (keys from <see cref="KeyOf"/>, e.g. the robust features), only those.
    /// </summary>
    public static IReadOnlyList<FeatureDelta> Deltas(VisitFeatures baseline, VisitFeatures followUp, IReadOnlySet<string>? keep = null)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(followUp);
        if (!string.Equals(baseline.Region, followUp.Region, StringComparison.Ordinal))
            throw new ArgumentException($"regions differ: '{baseline.Region}' vs '{followUp.Region}'", nameof(followUp));
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
            result.Add(new FeatureDelta(baseline.Region, f.Family, f.Feature, f.IbsiCode, f.AggregationCode, f.Value, v, delta, relative));
        }
        return result;
    }

    /// <summary>Writes the long-format series; NaN as an empty cell, dates as ISO 8601.</summary>
    public static void WriteLong(TextWriter writer, IEnumerable<VisitFeatures> visits, IReadOnlySet<string>? keep = null)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(visits);
        writer.Write(LongHeader + "\n");
        foreach (var visit in visits)
        foreach (var f in visit.Features)
        {
            if (keep is not null && !keep.Contains(KeyOf(f))) continue;
            writer.Write(string.Join(',', Csv(visit.VisitId), visit.Date?.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture) ?? "",
                Csv(visit.Region), Csv(f.Family), Csv(f.Feature), Csv(f.IbsiCode), Csv(f.AggregationCode), Number(f.Value)));
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
            writer.Write(string.Join(',', Csv(d.Region), Csv(d.Family), Csv(d.Feature), Csv(d.IbsiCode), Csv(d.AggregationCode),
                Number(d.Baseline), Number(d.FollowUp), Number(d.Delta), Number(d.RelativeDelta)));
            writer.Write('\n');
        }
    }

    private static string Number(double v) => double.IsFinite(v) ? v.ToString("R", CultureInfo.InvariantCulture) : "";

    private static string Csv(string s) =>
        s.AsSpan().IndexOfAny(",\"\n\r") >= 0 ? "\"" + s.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : s;
}
