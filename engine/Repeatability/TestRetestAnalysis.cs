using MathNet.Numerics.Distributions;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Repeatability;

/// <summary>
/// Test-retest statistics per measure over subjects × repeats (facts.md §1): wSD, wCV, RC, ICCs and
/// Bland-Altman limits. Handling of incomplete data (see docs/qa.md): missing values are skipped;
/// subjects with fewer than two values are excluded (counted in the notes, never named); wSD, wCV, RC and
/// ICC(1,·) use every remaining subject (unbalanced one-way ANOVA); ICC(2,·), ICC(3,·) and Bland-Altman
/// need complete subjects (every repeat label) and use only those.
/// </summary>
public static class TestRetestAnalysis
{
    /// <summary>1.96·√2 ≈ 2.77: RC = this × wSD (Bland, "repeatability" note).</summary>
    public static readonly double RcFactor = 1.959963984540054 * Math.Sqrt(2);

    /// <summary>Analyses every measure of a table, in order of first appearance.</summary>
    public static TestRetestReport Analyse(IReadOnlyList<RepeatabilityObservation> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        if (rows.Count == 0) throw new InputFormatException("no observations", "test-retest table", "add rows subject,measure,repeat,value");
        var measures = new List<MeasureRepeatability>();
        foreach (var group in rows.GroupBy(r => r.Measure, StringComparer.Ordinal))
            measures.Add(AnalyseMeasure(group.Key, group.ToList()));
        return new TestRetestReport(measures);
    }

    /// <summary>Analyses the rows of one measure.</summary>
    public static MeasureRepeatability AnalyseMeasure(string measure, IReadOnlyList<RepeatabilityObservation> rows)
    {
        var notes = new List<string>();
        var labels = rows.Select(r => r.Repeat).Distinct(StringComparer.Ordinal).ToList();
        var table = BuildTable(measure, rows, labels, notes);
        var used = table.Where(s => s.Values.Count(v => !double.IsNaN(v)) >= 2).ToList();
        int single = table.Count - used.Count;
        if (used.Count == 0)
            throw new InputFormatException(
                $"measure '{measure}' has no subject with two or more non-missing repeats", "test-retest table",
                "repeatability needs at least two repeat measurements of the same subject");
        if (single > 0) notes.Add($"{single} subject(s) with fewer than two non-missing repeats excluded from all estimates");

        var groups = used.Select(s => s.Values.Where(v => !double.IsNaN(v)).ToArray()).ToList();
        int nObs = groups.Sum(g => g.Length);
        double mean = groups.SelectMany(g => g).Average();
        var (wsd, dfW) = PooledSd(groups);
        var wsdCi = SdInterval(wsd, dfW);
        var (sdLog, wcv) = LogMethod(groups, notes);
        double? wcvRms = RmsCv(groups, notes);
        double rc = RcFactor * wsd;
        double? rcRel = wcv is double c ? RcFactor * c : (mean != 0 ? rc / Math.Abs(mean) : null);

        bool constant = groups.SelectMany(g => g).Distinct().Count() == 1;
        if (constant) notes.Add("all values are equal: wSD is 0 and the ICCs are undefined");
        var complete = used.Where(s => s.Values.All(v => !double.IsNaN(v))).ToList();
        var icc = Iccs(groups, complete, labels.Count, constant, notes);
        var ba = labels.Count == 2 && complete.Count >= 2 && !constant ? BlandAltman(labels, complete) : null;
        if (labels.Count == 2 && ba is null && !constant) notes.Add("Bland-Altman needs at least two subjects with both repeats");
        return new MeasureRepeatability(measure, used.Count, labels.Count, nObs, complete.Count, mean, wsd, wsdCi,
            wcv, wcvRms, sdLog, rc, rcRel, icc, ba, notes);
    }

    private sealed record SubjectRow(string Subject, double[] Values);

    private static List<SubjectRow> BuildTable(string measure, IReadOnlyList<RepeatabilityObservation> rows,
        List<string> labels, List<string> notes)
    {
        var bySubject = new Dictionary<string, SubjectRow>(StringComparer.Ordinal);
        var order = new List<SubjectRow>();
        int missing = 0;
        foreach (var r in rows)
        {
            if (!bySubject.TryGetValue(r.Subject, out var row))
            {
                row = new SubjectRow(r.Subject, Enumerable.Repeat(double.NaN, labels.Count).ToArray());
                bySubject[r.Subject] = row;
                order.Add(row);
            }
            int j = labels.IndexOf(r.Repeat);
            if (double.IsNaN(r.Value)) { missing++; continue; }
            if (!double.IsNaN(row.Values[j]))
                throw new InputFormatException(
                    $"measure '{measure}' has two values for one subject at repeat '{r.Repeat}'", "test-retest table",
                    "give each subject one value per measure and repeat label (use distinct labels for distinct repeats)");
            row.Values[j] = r.Value;
        }
        if (missing > 0) notes.Add($"{missing} missing value(s) skipped");
        return order;
    }

    internal static (double Sd, int Df) PooledSd(IReadOnlyList<double[]> groups)
    {
        double ss = 0;
        int df = 0;
        foreach (var g in groups)
        {
            double m = g.Average();
            foreach (var v in g) ss += (v - m) * (v - m);
            df += g.Length - 1;
        }
        return (Math.Sqrt(ss / df), df);
    }

    private static Estimate SdInterval(double sd, int df)
    {
        double lo = Math.Sqrt(df * sd * sd / ChiSquared.InvCDF(df, 0.975));
        double hi = Math.Sqrt(df * sd * sd / ChiSquared.InvCDF(df, 0.025));
        return new Estimate(sd, IccCalculator.Finite(lo), IccCalculator.Finite(hi));
    }

    /// <summary>Log method (Bland &amp; Altman, BMJ 1996;313:106): s = wSD of ln values; wCV = √(exp(s²) − 1).</summary>
    private static (double? SdLog, double? Wcv) LogMethod(IReadOnlyList<double[]> groups, List<string> notes)
    {
        if (groups.Any(g => g.Any(v => v <= 0)))
        {
            notes.Add("wCV (log method) undefined: some values are zero or negative; use wSD and RC");
            return (null, null);
        }
        var (s, _) = PooledSd(groups.Select(g => g.Select(v => Math.Log(v)).ToArray()).ToList());
        return (s, Math.Sqrt(Math.Exp(s * s) - 1));
    }

    private static double? RmsCv(IReadOnlyList<double[]> groups, List<string> notes)
    {
        double sum = 0;
        foreach (var g in groups)
        {
            double m = g.Average();
            if (m == 0) { notes.Add("wCV (RMS method) undefined: a subject mean is zero"); return null; }
            var (sd, _) = PooledSd([g]);
            sum += sd * sd / (m * m);
        }
        return Math.Sqrt(sum / groups.Count);
    }

    private static IccSet Iccs(IReadOnlyList<double[]> groups, List<SubjectRow> complete, int k, bool constant, List<string> notes)
    {
        var none = new Estimate(null, null, null);
        if (constant) return new IccSet(none, none, none, none, none, none);
        Estimate i11 = none, i1k = none;
        if (groups.Count >= 2)
        {
            var (a, b, k0) = IccCalculator.OneWay(groups);
            (i11, i1k) = (a, b);
            if (Math.Abs(k0 - k) > 1e-9) notes.Add($"unbalanced data: ICC(1,·) uses effective repeats k0 = {k0:F3}");
        }
        else notes.Add("ICC(1,·) needs at least two subjects");
        if (k < 2 || complete.Count < 2)
        {
            notes.Add("ICC(2,·) and ICC(3,·) need at least two subjects with every repeat");
            return new IccSet(i11, none, none, i1k, none, none);
        }
        if (complete.Count < groups.Count)
            notes.Add($"ICC(2,·), ICC(3,·) and Bland-Altman use the {complete.Count} subject(s) with every repeat");
        var x = new double[complete.Count, k];
        for (int i = 0; i < complete.Count; i++)
            for (int j = 0; j < k; j++) x[i, j] = complete[i].Values[j];
        var (i21, i31, i2k, i3k) = IccCalculator.TwoWayForms(IccCalculator.MeanSquares(x));
        return new IccSet(i11, i21, i31, i1k, i2k, i3k);
    }

    private static BlandAltmanResult BlandAltman(List<string> labels, List<SubjectRow> complete)
    {
        int n = complete.Count;
        var d = complete.Select(s => s.Values[1] - s.Values[0]).ToArray();
        double bias = d.Average();
        double sd = Math.Sqrt(d.Sum(v => (v - bias) * (v - bias)) / (n - 1));
        double t = StudentT.InvCDF(0, 1, n - 1, 0.975);
        double z = 1.959963984540054;
        double seBias = sd / Math.Sqrt(n), seLimit = sd * Math.Sqrt(3.0 / n);
        double lo = bias - z * sd, hi = bias + z * sd;
        return new BlandAltmanResult(labels[0], labels[1], n,
            new Estimate(bias, bias - t * seBias, bias + t * seBias), sd,
            new Estimate(lo, lo - t * seLimit, lo + t * seLimit),
            new Estimate(hi, hi - t * seLimit, hi + t * seLimit));
    }
}
