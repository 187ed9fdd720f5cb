namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>
/// Robustness filtering of radiomic features: test-retest ICC and correlation with acquisition parameters,
/// so that delta and time-series features are built only from features that repeat and do not track the protocol.
/// </summary>
public static class FeatureRobustness
{
    /// <summary>
    /// Default ICC threshold 0.75: the lower bound of "good" reliability in Koo &amp; Li, J Chiropr Med 2016;15:155
    /// (below 0.5 poor, 0.5–0.75 moderate, 0.75–0.9 good, above 0.9 excellent).
    /// </summary>
    public const double DefaultIccThreshold = 0.75;

    /// <summary>Default |ρ| at which a correlation with an acquisition parameter counts as strong (common practice: 0.7).</summary>
    public const double DefaultCorrelationThreshold = 0.7;

    /// <summary>
    /// ICC(2,1) per feature (family, code, aggregation, name) and per region and image when the values name them;
    /// <c>Robust</c> when ICC ≥ threshold.
    /// </summary>
    public static IReadOnlyList<FeatureReliability> TestRetest(IReadOnlyList<TestRetestValue> values, double iccThreshold = DefaultIccThreshold)
    {
        ArgumentNullException.ThrowIfNull(values);
        var result = new List<FeatureReliability>();
        foreach (var group in values.GroupBy(v => $"{v.Region}|{v.Image}|{Key(v.Feature)}").OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            var first = group.First();
            var repeats = group.Select(v => v.Repeat).Distinct().OrderBy(r => r).ToArray();
            var subjects = group.GroupBy(v => v.SubjectId, StringComparer.Ordinal)
                .Where(s => repeats.All(r => s.Any(v => v.Repeat == r && double.IsFinite(v.Feature.Value))))
                .OrderBy(s => s.Key, StringComparer.Ordinal).ToList();
            var ratings = new double[subjects.Count, repeats.Length];
            for (int i = 0; i < subjects.Count; i++)
            for (int j = 0; j < repeats.Length; j++)
                ratings[i, j] = subjects[i].First(v => v.Repeat == repeats[j]).Feature.Value;
            double icc = Icc21(ratings);
            var f = first.Feature;
            result.Add(new FeatureReliability(f.Family, f.Feature, f.IbsiCode, f.AggregationCode,
                icc, subjects.Count, repeats.Length, icc >= iccThreshold, first.Region, first.Image));
        }
        return result;
    }

    /// <summary>
    /// ICC(2,1) of an n-subjects × k-repeats table: (MSR − MSE) / (MSR + (k−1)·MSE + k·(MSC − MSE)/n), with MSR, MSC
    /// and MSE the row, column and residual mean squares of the two-way ANOVA (Shrout &amp; Fleiss 1979, case 2).
    /// </summary>
    public static double Icc21(double[,] ratings)
    {
        ArgumentNullException.ThrowIfNull(ratings);
        int n = ratings.GetLength(0), k = ratings.GetLength(1);
        if (n < 2 || k < 2) return double.NaN;
        double grand = 0;
        var rowMean = new double[n];
        var colMean = new double[k];
        for (int i = 0; i < n; i++)
        for (int j = 0; j < k; j++)
        {
            rowMean[i] += ratings[i, j] / k;
            colMean[j] += ratings[i, j] / n;
            grand += ratings[i, j] / (n * k);
        }
        double ssRows = 0, ssCols = 0, ssTotal = 0;
        for (int i = 0; i < n; i++) ssRows += k * (rowMean[i] - grand) * (rowMean[i] - grand);
        for (int j = 0; j < k; j++) ssCols += n * (colMean[j] - grand) * (colMean[j] - grand);
        for (int i = 0; i < n; i++)
        for (int j = 0; j < k; j++) ssTotal += (ratings[i, j] - grand) * (ratings[i, j] - grand);
        double msr = ssRows / (n - 1), msc = ssCols / (k - 1), mse = (ssTotal - ssRows - ssCols) / ((n - 1.0) * (k - 1.0));
        double denominator = msr + (k - 1) * mse + k * (msc - mse) / n;
        return denominator > 0 ? (msr - mse) / denominator : double.NaN;
    }

    /// <summary>Spearman ρ of every feature with every acquisition parameter present in all exams.</summary>
    public static IReadOnlyList<AcquisitionCorrelation> AcquisitionCorrelations(IReadOnlyList<ExamFeatures> exams,
        double threshold = DefaultCorrelationThreshold)
    {
        ArgumentNullException.ThrowIfNull(exams);
        var result = new List<AcquisitionCorrelation>();
        if (exams.Count == 0) return result;
        var parameters = exams[0].AcquisitionParameters.Keys.Where(p => exams.All(e => e.AcquisitionParameters.ContainsKey(p)))
            .OrderBy(p => p, StringComparer.Ordinal).ToList();
        var byKey = exams.Select(e =>
        {
            var d = new Dictionary<string, double>(StringComparer.Ordinal);
            foreach (var x in e.Features) d[Key(x)] = x.Value;
            return d;
        }).ToList();
        foreach (var f in exams[0].Features)
        {
            var key = Key(f);
            var values = byKey.Select(d => d.TryGetValue(key, out double v) ? v : double.NaN).ToArray();
            foreach (var p in parameters)
            {
                var x = new List<double>();
                var y = new List<double>();
                for (int e = 0; e < exams.Count; e++)
                {
                    double a = exams[e].AcquisitionParameters[p];
                    if (!double.IsFinite(values[e]) || !double.IsFinite(a)) continue;
                    x.Add(values[e]); y.Add(a);
                }
                double rho = x.Count >= 3 ? Spearman(x, y) : double.NaN;
                result.Add(new AcquisitionCorrelation(f.Family, f.Feature, f.IbsiCode, f.AggregationCode, p, rho, x.Count,
                    Math.Abs(rho) >= threshold));
            }
        }
        return result;
    }

    /// <summary>Spearman's ρ: Pearson correlation of the ranks, ties given their average rank.</summary>
    public static double Spearman(IReadOnlyList<double> x, IReadOnlyList<double> y)
    {
        var rx = Ranks(x);
        var ry = Ranks(y);
        double mx = rx.Average(), my = ry.Average(), sxy = 0, sxx = 0, syy = 0;
        for (int i = 0; i < rx.Length; i++)
        {
            sxy += (rx[i] - mx) * (ry[i] - my);
            sxx += (rx[i] - mx) * (rx[i] - mx);
            syy += (ry[i] - my) * (ry[i] - my);
        }
        return sxx > 0 && syy > 0 ? sxy / Math.Sqrt(sxx * syy) : double.NaN;
    }

    private static double[] Ranks(IReadOnlyList<double> v)
    {
        var order = Enumerable.Range(0, v.Count).OrderBy(i => v[i]).ToArray();
        var ranks = new double[v.Count];
        for (int start = 0; start < order.Length;)
        {
            int end = start;
            while (end + 1 < order.Length && v[order[end + 1]] == v[order[start]]) end++;
            double rank = (start + end) / 2.0 + 1;
            for (int t = start; t <= end; t++) ranks[order[t]] = rank;
            start = end + 1;
        }
        return ranks;
    }

    private static string Key(FeatureValue f) => Series.RadiomicsTimeSeries.KeyOf(f);
}
