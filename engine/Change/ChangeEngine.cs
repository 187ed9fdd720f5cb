using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Change;

/// <summary>
/// Turns per-visit values into changes (each follow-up vs the baseline and vs the previous visit, with
/// 95 % bands), trends over all visits, PSA kinetics and lesion ADC histogram distances. docs/change.md.
/// </summary>
public static class ChangeEngine
{
    /// <summary>Id used for the lesion ADC histogram distances.</summary>
    public const string HistogramMeasureId = "lesion.adc.histogram";

    /// <summary>Analyses the visits; they must be indexed 0..n−1 with strictly increasing dates.</summary>
    public static ChangeAnalysis Analyse(IReadOnlyList<VisitMeasurements> visits, IReadOnlyList<MeasureDescriptor> measures,
        RepeatabilityProfile profile, IReadOnlyList<PsaSample>? psa = null)
    {
        ValidateVisits(visits);
        var flags = new List<string>();
        var changes = new List<MeasureChange>();
        var trends = new List<MeasureTrend>();
        foreach (var m in measures)
        {
            var entry = profile.Find(m.RepeatabilityId);
            for (int v = 1; v < visits.Count; v++)
            {
                AddChange(changes, flags, m, entry, visits[0], visits[v]);
                if (v > 1) AddChange(changes, flags, m, entry, visits[v - 1], visits[v]);
            }
            var points = visits.Where(v => Ok(v, m.Id) is not null).Select(v => new DatedValue(v.Date, Ok(v, m.Id)!.Value)).ToList();
            if (TrendFitter.Fit(m.Id, m.Unit, m.TrendScale, points, entry) is { } trend) trends.Add(trend);
        }
        if (psa is { Count: > 0 }) trends.AddRange(PsaKinetics.Trends(psa));
        return new ChangeAnalysis(changes, trends, Histograms(visits), flags);
    }

    private static void AddChange(List<MeasureChange> changes, List<string> flags, MeasureDescriptor m, RepeatabilityEntry? entry,
        VisitMeasurements from, VisitMeasurements to)
    {
        double? a = Ok(from, m.Id), b = Ok(to, m.Id);
        if (a is double x && b is double y)
        {
            changes.Add(ChangeBands.Compare(m.Id, m.Unit, from.Index, to.Index, x, y, entry));
            return;
        }
        if (a is not null || b is not null)
        {
            var missing = a is null ? from : to;
            string why = missing.Values.TryGetValue(m.Id, out var mv) ? mv.Reason ?? mv.Status.ToString() : "not measured";
            flags.Add($"{m.Id}: no change from visit {from.Index} to visit {to.Index} because visit {missing.Index} has no value ({why})");
        }
    }

    private static double? Ok(VisitMeasurements v, string id) =>
        v.Values.TryGetValue(id, out var mv) && mv.Status == MeasureStatus.Ok && mv.Value is double d && double.IsFinite(d) ? d : null;

    private static List<HistogramDistance> Histograms(IReadOnlyList<VisitMeasurements> visits)
    {
        var list = new List<HistogramDistance>();
        for (int v = 1; v < visits.Count; v++)
        {
            Add(visits[0], visits[v]);
            if (v > 1) Add(visits[v - 1], visits[v]);
        }
        return list;

        void Add(VisitMeasurements a, VisitMeasurements b)
        {
            if (a.LesionAdc is not { Length: > 0 } x || b.LesionAdc is not { Length: > 0 } y) return;
            list.Add(new HistogramDistance(HistogramMeasureId, "10^-6 mm2/s", a.Index, b.Index,
                HistogramDistances.Wasserstein1(x, y), HistogramDistances.KolmogorovSmirnov(x, y), x.Length, y.Length));
        }
    }

    private static void ValidateVisits(IReadOnlyList<VisitMeasurements> visits)
    {
        for (int i = 0; i < visits.Count; i++)
        {
            if (visits[i].Index != i)
                throw new InvalidParameterException($"visit {i} carries index {visits[i].Index}", "visits",
                    "number visits 0 (baseline), 1, 2 … in date order");
            if (i > 0 && visits[i].Date <= visits[i - 1].Date)
                throw new InvalidParameterException(
                    $"visit dates are out of order: visit {i} ({visits[i].Date:yyyy-MM-dd}) is not after visit {i - 1} ({visits[i - 1].Date:yyyy-MM-dd})",
                    "visits", "order the exams by date, baseline first");
        }
    }
}
