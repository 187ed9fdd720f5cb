using MathNet.Numerics.Distributions;

namespace Serimetry.Engine.Repeatability;

/// <summary>
/// Mean squares and intraclass correlations of Shrout &amp; Fleiss (1979), Psychol Bull 86:420
/// (formulas as in facts.md §1), with 95 % CIs of McGraw &amp; Wong (1996), Psychol Methods 1:30.
/// </summary>
internal static class IccCalculator
{
    private const double Alpha = 0.05;

    /// <summary>Two-way ANOVA mean squares of a complete n × k table (rows = subjects, columns = repeats).</summary>
    internal readonly record struct TwoWay(int N, int K, double Msr, double Msc, double Mse, double Msw);

    internal static TwoWay MeanSquares(double[,] x)
    {
        int n = x.GetLength(0), k = x.GetLength(1);
        double grand = 0;
        var rowMean = new double[n];
        var colMean = new double[k];
        for (int i = 0; i < n; i++)
            for (int j = 0; j < k; j++) { rowMean[i] += x[i, j] / k; colMean[j] += x[i, j] / n; grand += x[i, j]; }
        grand /= n * k;
        double ssr = 0, ssc = 0, sst = 0;
        for (int i = 0; i < n; i++) ssr += k * (rowMean[i] - grand) * (rowMean[i] - grand);
        for (int j = 0; j < k; j++) ssc += n * (colMean[j] - grand) * (colMean[j] - grand);
        for (int i = 0; i < n; i++)
            for (int j = 0; j < k; j++) sst += (x[i, j] - grand) * (x[i, j] - grand);
        double sse = Math.Max(0, sst - ssr - ssc);
        double ssw = Math.Max(0, sst - ssr);
        return new TwoWay(n, k, ssr / (n - 1), ssc / (k - 1), sse / ((n - 1.0) * (k - 1)), ssw / (n * (k - 1.0)));
    }

    /// <summary>ICC(2,1), ICC(3,1), ICC(2,k), ICC(3,k) of a complete table.</summary>
    internal static (Estimate I21, Estimate I31, Estimate I2k, Estimate I3k) TwoWayForms(TwoWay m)
    {
        int n = m.N, k = m.K;
        double icc3 = (m.Msr - m.Mse) / (m.Msr + (k - 1) * m.Mse);
        double icc3k = (m.Msr - m.Mse) / m.Msr;
        double f3 = m.Msr / m.Mse;
        double df1 = n - 1, df2 = (n - 1.0) * (k - 1);
        var (fl, fu) = FBounds(f3, df1, df2);
        var i31 = Make(icc3, (fl - 1) / (fl + k - 1), (fu - 1) / (fu + k - 1));
        var i3k = Make(icc3k, 1 - 1 / fl, 1 - 1 / fu);

        double icc2 = (m.Msr - m.Mse) / (m.Msr + (k - 1) * m.Mse + k * (m.Msc - m.Mse) / n);
        double icc2k = (m.Msr - m.Mse) / (m.Msr + (m.Msc - m.Mse) / n);
        var (lo2, hi2) = Icc21Bounds(m, icc2);
        var i21 = Make(icc2, lo2, hi2);
        var i2k = Make(icc2k, SpearmanBrown(lo2, k), SpearmanBrown(hi2, k));
        return (i21, i31, i2k, i3k);
    }

    /// <summary>
    /// One-way random-effects ICC(1,1) and ICC(1,k) from subjects with unequal numbers of repeats, using
    /// the effective group size k0 = (N − Σnᵢ²/N)/(n − 1) (equal to k when balanced).
    /// </summary>
    internal static (Estimate I11, Estimate I1k, double K0) OneWay(IReadOnlyList<double[]> groups)
    {
        int n = groups.Count;
        long total = 0;
        double sumSq = 0, grand = 0;
        foreach (var g in groups) { total += g.Length; sumSq += (double)g.Length * g.Length; foreach (var v in g) grand += v; }
        grand /= total;
        double ssb = 0, ssw = 0;
        foreach (var g in groups)
        {
            double mean = g.Average();
            ssb += g.Length * (mean - grand) * (mean - grand);
            foreach (var v in g) ssw += (v - mean) * (v - mean);
        }
        double msb = ssb / (n - 1), msw = ssw / (total - n);
        double k0 = (total - sumSq / total) / (n - 1);
        double icc1 = (msb - msw) / (msb + (k0 - 1) * msw);
        double icc1k = (msb - msw) / msb;
        var (fl, fu) = FBounds(msb / msw, n - 1, total - n);
        return (Make(icc1, (fl - 1) / (fl + k0 - 1), (fu - 1) / (fu + k0 - 1)), Make(icc1k, 1 - 1 / fl, 1 - 1 / fu), k0);
    }

    /// <summary>FL = F/F(1−α/2; df1, df2), FU = F·F(1−α/2; df2, df1).</summary>
    private static (double Fl, double Fu) FBounds(double f, double df1, double df2)
    {
        if (!double.IsFinite(f)) return (double.NaN, double.NaN);
        double q1 = FisherSnedecor.InvCDF(df1, df2, 1 - Alpha / 2);
        double q2 = FisherSnedecor.InvCDF(df2, df1, 1 - Alpha / 2);
        return (f / q1, f * q2);
    }

    /// <summary>Satterthwaite-based CI of ICC(2,1) (McGraw &amp; Wong 1996, Table 7, case 2A).</summary>
    private static (double Lo, double Hi) Icc21Bounds(TwoWay m, double icc)
    {
        int n = m.N, k = m.K;
        if (!double.IsFinite(icc) || m.Mse <= 0) return (double.NaN, double.NaN);
        double fj = m.Msc / m.Mse;
        double a = k * icc / (n * (1 - icc));
        double b = 1 + k * icc * (n - 1) / (n * (1 - icc));
        double v = (a * fj + b) * (a * fj + b) * (n - 1) * (k - 1)
                   / (a * a * fj * fj * (n - 1) + b * b);
        if (!double.IsFinite(v) || v <= 0) return (double.NaN, double.NaN);
        double fStar = FisherSnedecor.InvCDF(n - 1, v, 1 - Alpha / 2);
        double fStar2 = FisherSnedecor.InvCDF(v, n - 1, 1 - Alpha / 2);
        double common = k * m.Msc + (k * n - k - n) * m.Mse;
        double lo = n * (m.Msr - fStar * m.Mse) / (fStar * common + n * m.Msr);
        double hi = n * (fStar2 * m.Msr - m.Mse) / (common + n * fStar2 * m.Msr);
        return (lo, hi);
    }

    private static double SpearmanBrown(double r, int k) => k * r / (1 + (k - 1) * r);

    private static Estimate Make(double v, double lo, double hi) =>
        new(Finite(v), Finite(lo), Finite(hi));

    internal static double? Finite(double v) => double.IsFinite(v) ? v : null;
}
