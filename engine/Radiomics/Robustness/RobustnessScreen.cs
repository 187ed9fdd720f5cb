using System.Globalization;
using Serimetry.Engine.Radiomics.Series;

namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>
/// Whether one feature of one region and image is used for deltas, and why; <c>Icc</c> is ICC(2,1) from the
/// test-retest table, null when none was given or the feature is not in it.
/// </summary>
public sealed record FeatureDecision(string Region, string Image, string Family, string Feature, string IbsiCode, string AggregationCode,
    double? Icc, bool Kept, string Reason);

/// <summary>
/// A feature's correlation with an acquisition parameter across the visits, for one region and image;
/// <c>UsedForScreening</c> is true when there were enough visits (<see cref="RobustnessScreening.MinExamsForAcquisitionScreen"/>)
/// for a strong correlation to drop the feature.
/// </summary>
public sealed record ScopedCorrelation(string Region, string Image, AcquisitionCorrelation Correlation, bool UsedForScreening);

/// <summary>
/// The outcome of robustness filtering over a comparison's per-visit features: <c>Filtered</c> is true when a
/// test-retest reference was applied (false: unfiltered); <c>Summary</c> is one line for change.json.
/// </summary>
public sealed record RobustnessScreen(bool Filtered, string Summary, IReadOnlyList<FeatureDecision> Decisions,
    IReadOnlyList<ScopedCorrelation> Correlations)
{
    private readonly Dictionary<string, bool> kept = Decisions.ToDictionary(
        d => Scope(d.Region, d.Image) + RadiomicsTimeSeries.KeyOf(new FeatureValue(d.Family, d.Feature, d.IbsiCode, d.AggregationCode, 0)),
        d => d.Kept, StringComparer.Ordinal);

    /// <summary>
    /// The robust flag of a feature in a visit's region and image: false when dropped, true when kept after a
    /// test-retest check, null when kept unfiltered (no test-retest reference).
    /// </summary>
    public bool? IsRobust(VisitFeatures visit, FeatureValue feature)
    {
        bool k = kept.TryGetValue(Scope(visit.Region, visit.Image) + RadiomicsTimeSeries.KeyOf(feature), out bool value) && value;
        return k && !Filtered ? null : k;
    }

    /// <summary>Keys (<see cref="RadiomicsTimeSeries.KeyOf"/>) of the features kept for a region and image, for the deltas.</summary>
    public IReadOnlySet<string> Kept(string region, string image) => Decisions
        .Where(d => d.Kept && d.Region == region && d.Image == image)
        .Select(d => RadiomicsTimeSeries.KeyOf(new FeatureValue(d.Family, d.Feature, d.IbsiCode, d.AggregationCode, 0)))
        .ToHashSet(StringComparer.Ordinal);

    internal static string Scope(string region, string image) => region + "|" + image + "|";
}

/// <summary>
/// Robustness filtering inside a comparison: a feature is kept for deltas and time series when its test-retest ICC
/// reaches the threshold (<see cref="FeatureRobustness.DefaultIccThreshold"/>, Koo &amp; Li 2016) and it is not strongly
/// correlated (|ρ| ≥ <see cref="FeatureRobustness.DefaultCorrelationThreshold"/>) with an acquisition parameter across
/// the visits. Without a test-retest reference every feature is kept and the outputs say so.
/// </summary>
public static class RobustnessScreening
{
    /// <summary>
    /// Fewest visits for a strong acquisition correlation to drop a feature. With 3 or 4 visits a perfect rank
    /// correlation arises by chance in 1 of 3 or 1 of 12 cases (two of n! orderings), too often to act on; with 5 in 1
    /// of 60 (Spearman's exact null distribution). Fewer visits are still reported.
    /// </summary>
    public const int MinExamsForAcquisitionScreen = 5;

    /// <summary>Decides every feature of <paramref name="visits"/>; <paramref name="acquisitionOf"/> gives a visit's acquisition parameters for its image.</summary>
    public static RobustnessScreen Screen(IReadOnlyList<VisitFeatures> visits, Func<VisitFeatures, IReadOnlyDictionary<string, double>> acquisitionOf,
        RobustnessReference? reference)
    {
        ArgumentNullException.ThrowIfNull(visits);
        ArgumentNullException.ThrowIfNull(acquisitionOf);
        var correlations = new List<ScopedCorrelation>();
        var decisions = new List<FeatureDecision>();
        var lookup = reference is null ? null : ReliabilityLookup(reference);
        foreach (var scope in visits.GroupBy(v => (v.Region, v.Image)))
        {
            var exams = scope.Select(v => new ExamFeatures(v.VisitId, acquisitionOf(v), v.Features)).ToList();
            var scoped = FeatureRobustness.AcquisitionCorrelations(exams)
                .Where(c => double.IsFinite(c.SpearmanRho))
                .Select(c => new ScopedCorrelation(scope.Key.Region, scope.Key.Image, c, c.Exams >= MinExamsForAcquisitionScreen))
                .ToList();
            correlations.AddRange(scoped);
            var strong = scoped.Where(c => c.Correlation.Strong && c.UsedForScreening)
                .GroupBy(c => Key(c.Correlation.Family, c.Correlation.Feature, c.Correlation.IbsiCode, c.Correlation.AggregationCode))
                .ToDictionary(g => g.Key, g => g.OrderByDescending(c => Math.Abs(c.Correlation.SpearmanRho)).First().Correlation, StringComparer.Ordinal);
            var seen = new HashSet<string>(StringComparer.Ordinal);
            foreach (var f in scope.SelectMany(v => v.Features))
            {
                var key = RadiomicsTimeSeries.KeyOf(f);
                if (!seen.Add(key)) continue;
                decisions.Add(Decide(scope.Key.Region, scope.Key.Image, f, key, reference, lookup, strong));
            }
        }
        return new RobustnessScreen(reference is not null, Summary(visits, reference, decisions, correlations), decisions, correlations);
    }

    private static FeatureDecision Decide(string region, string image, FeatureValue f, string key, RobustnessReference? reference,
        Dictionary<string, FeatureReliability>? lookup, Dictionary<string, AcquisitionCorrelation> strong)
    {
        double? icc = null;
        bool kept = true;
        string reason;
        if (reference is null || lookup is null) reason = "unfiltered: no test-retest table";
        else if (!lookup.TryGetValue(RobustnessScreen.Scope(region, image) + key, out var r) && !lookup.TryGetValue(RobustnessScreen.Scope("", "") + key, out r))
            (kept, reason) = (false, "not in the test-retest table");
        else if (!double.IsFinite(r.Icc))
            (icc, kept, reason) = (null, false, $"ICC undefined ({r.Subjects} complete subjects, {r.Repeats} repeats, or no variance)");
        else
        {
            icc = r.Icc;
            kept = r.Icc >= reference.IccThreshold;
            reason = kept ? $"ICC {F(r.Icc)} ≥ {F(reference.IccThreshold)}" : $"ICC {F(r.Icc)} < {F(reference.IccThreshold)}";
        }
        if (strong.TryGetValue(key, out var c))
        {
            kept = false;
            reason += $"; tracks {c.Parameter} across visits (ρ = {F(c.SpearmanRho)}, {c.Exams} visits)";
        }
        return new FeatureDecision(region, image, f.Family, f.Feature, f.IbsiCode, f.AggregationCode, icc, kept, reason);
    }

    private static Dictionary<string, FeatureReliability> ReliabilityLookup(RobustnessReference reference)
    {
        var d = new Dictionary<string, FeatureReliability>(StringComparer.Ordinal);
        foreach (var r in reference.Reliabilities)
            d[RobustnessScreen.Scope(r.Region, r.Image) + Key(r.Family, r.Feature, r.IbsiCode, r.AggregationCode)] = r;
        return d;
    }

    private static string Summary(IReadOnlyList<VisitFeatures> visits, RobustnessReference? reference, List<FeatureDecision> decisions,
        List<ScopedCorrelation> correlations)
    {
        int nVisits = visits.Select(v => v.VisitId).Distinct().Count();
        int dropped = decisions.Count(d => !d.Kept);
        int byAcquisition = decisions.Count(d => d.Reason.Contains("tracks ", StringComparison.Ordinal));
        string filter = reference is null
            ? "unfiltered: no test-retest table was given (compare --radiomics-robustness FILE), so deltas use every feature"
            : $"filtered: ICC(2,1) ≥ {F(reference.IccThreshold)} (Koo & Li 2016) from '{reference.Source}' ({reference.Subjects} subjects, " +
              $"{reference.Repeats} repeats); {decisions.Count - dropped} of {decisions.Count} region features kept";
        string acquisition = nVisits < 3
            ? $"acquisition screen not possible with {nVisits} visits (needs 3 to report, {MinExamsForAcquisitionScreen} to drop)"
            : correlations.Count == 0 ? "acquisition screen: no acquisition parameter varies across the visits"
            : nVisits < MinExamsForAcquisitionScreen
                ? $"acquisition correlations reported only ({nVisits} visits; {MinExamsForAcquisitionScreen} needed to drop a feature)"
                : $"acquisition screen dropped {byAcquisition} (|ρ| ≥ {F(FeatureRobustness.DefaultCorrelationThreshold)})";
        return $"{filter}; {acquisition}; details in radiomics-robustness.csv and radiomics-acquisition.csv";
    }

    private static string Key(string family, string feature, string code, string aggregation) =>
        RadiomicsTimeSeries.KeyOf(new FeatureValue(family, feature, code, aggregation, 0));

    private static string F(double v) => v.ToString("0.###", CultureInfo.InvariantCulture);
}
