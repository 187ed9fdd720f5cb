using System.Globalization;
using System.Net;
using System.Text;

namespace Serimetry.Engine.Reports.Pictures;

/// <summary>One point of a measure over time, with the 95 % band of its change against baseline.</summary>
internal sealed record TimePoint(double Years, string Label, double Value, double? BandLow, double? BandHigh);

/// <summary>One sample set drawn as a histogram.</summary>
internal sealed record HistogramSeries(string Label, IReadOnlyList<double> Values, string Colour);

/// <summary>
/// Small inline SVG charts for the HTML report (text stays sharp and selectable, no raster fonts needed).
/// </summary>
internal static class SvgChart
{
    private const int W = 380, H = 220, Left = 56, Right = 32, Top = 28, Bottom = 40;

    /// <summary>A measure over time: points joined by a line, each follow-up's 95 % band as a vertical bar.</summary>
    public static string MeasureOverTime(string title, string unit, IReadOnlyList<TimePoint> points)
    {
        if (points.Count == 0) return "";
        double x0 = points.Min(p => p.Years), x1 = points.Max(p => p.Years);
        if (x1 - x0 < 1e-9) x1 = x0 + 1;
        var ys = points.SelectMany(p => new[] { p.Value, p.BandLow ?? p.Value, p.BandHigh ?? p.Value }).Where(double.IsFinite).ToList();
        double y0 = ys.Min(), y1 = ys.Max();
        Pad(ref y0, ref y1);
        var sb = Begin(title);
        Axes(sb, y0, y1, unit);
        string X(double v) => F(Left + (v - x0) / (x1 - x0) * (W - Left - Right));
        string Y(double v) => F(H - Bottom - (v - y0) / (y1 - y0) * (H - Top - Bottom));
        foreach (var p in points.Where(p => p.BandLow is not null && p.BandHigh is not null))
            sb.Append($"<line x1=\"{X(p.Years)}\" x2=\"{X(p.Years)}\" y1=\"{Y(p.BandLow!.Value)}\" y2=\"{Y(p.BandHigh!.Value)}\" stroke=\"#9bb7d4\" stroke-width=\"8\" stroke-linecap=\"round\"/>");
        sb.Append("<polyline fill=\"none\" stroke=\"#1f4e79\" stroke-width=\"2\" points=\"");
        foreach (var p in points) sb.Append($"{X(p.Years)},{Y(p.Value)} ");
        sb.Append("\"/>");
        foreach (var p in points)
        {
            sb.Append($"<circle cx=\"{X(p.Years)}\" cy=\"{Y(p.Value)}\" r=\"4\" fill=\"#1f4e79\"/>");
            sb.Append($"<text x=\"{X(p.Years)}\" y=\"{H - Bottom + 16}\" font-size=\"10\" text-anchor=\"middle\">{Esc(p.Label)}</text>");
        }
        return End(sb);
    }

    /// <summary>Overlaid histograms (normalised to equal area) on a shared set of bins.</summary>
    public static string Histograms(string title, string unit, IReadOnlyList<HistogramSeries> series, int bins = 30)
    {
        var all = series.SelectMany(s => s.Values).Where(double.IsFinite).ToList();
        if (all.Count == 0) return "";
        double lo = all.Min(), hi = all.Max();
        if (hi - lo < 1e-9) hi = lo + 1;
        var densities = series.Select(s => Density(s.Values, lo, hi, bins)).ToList();
        double top = Math.Max(1e-12, densities.SelectMany(d => d).Max());
        var sb = Begin(title);
        Axes(sb, 0, top, "fraction", xLabel: unit, xLow: lo, xHigh: hi);
        double bw = (W - Left - Right) / (double)bins;
        for (int s = 0; s < series.Count; s++)
        {
            sb.Append($"<polyline fill=\"none\" stroke=\"{series[s].Colour}\" stroke-width=\"2\" points=\"");
            for (int b = 0; b < bins; b++)
            {
                double y = H - Bottom - densities[s][b] / top * (H - Top - Bottom);
                sb.Append($"{F(Left + b * bw)},{F(y)} {F(Left + (b + 1) * bw)},{F(y)} ");
            }
            sb.Append("\"/>");
            sb.Append($"<text x=\"{W - Right - 4}\" y=\"{Top + 12 + 13 * s}\" font-size=\"11\" text-anchor=\"end\" fill=\"{series[s].Colour}\">{Esc(series[s].Label)}</text>");
        }
        return End(sb);
    }

    private static double[] Density(IReadOnlyList<double> values, double lo, double hi, int bins)
    {
        var d = new double[bins];
        int n = 0;
        foreach (var v in values)
        {
            if (!double.IsFinite(v)) continue;
            int b = Math.Clamp((int)((v - lo) / (hi - lo) * bins), 0, bins - 1);
            d[b]++;
            n++;
        }
        if (n > 0) for (int b = 0; b < bins; b++) d[b] /= n;
        return d;
    }

    private static void Pad(ref double lo, ref double hi)
    {
        double span = hi - lo;
        if (span < 1e-12) span = Math.Max(1e-6, Math.Abs(hi) * 0.1);
        lo -= 0.1 * span;
        hi += 0.1 * span;
    }

    private static StringBuilder Begin(string title)
    {
        var sb = new StringBuilder();
        sb.Append($"<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {W} {H}\" width=\"{W}\" height=\"{H}\" role=\"img\" aria-label=\"{Esc(title)}\">");
        sb.Append($"<text x=\"{Left}\" y=\"16\" font-size=\"12\" font-weight=\"bold\">{Esc(title)}</text>");
        return sb;
    }

    private static void Axes(StringBuilder sb, double y0, double y1, string yLabel, string? xLabel = null, double xLow = 0, double xHigh = 0)
    {
        sb.Append($"<line x1=\"{Left}\" y1=\"{Top}\" x2=\"{Left}\" y2=\"{H - Bottom}\" stroke=\"#555\"/>");
        sb.Append($"<line x1=\"{Left}\" y1=\"{H - Bottom}\" x2=\"{W - Right}\" y2=\"{H - Bottom}\" stroke=\"#555\"/>");
        for (int t = 0; t <= 4; t++)
        {
            double v = y0 + (y1 - y0) * t / 4;
            double y = H - Bottom - t / 4.0 * (H - Top - Bottom);
            sb.Append($"<text x=\"{Left - 4}\" y=\"{F(y + 3)}\" font-size=\"10\" text-anchor=\"end\">{Esc(Num(v))}</text>");
        }
        sb.Append($"<text x=\"12\" y=\"{(Top + H - Bottom) / 2}\" font-size=\"10\" transform=\"rotate(-90 12 {(Top + H - Bottom) / 2})\" text-anchor=\"middle\">{Esc(yLabel)}</text>");
        if (xLabel is not null)
        {
            sb.Append($"<text x=\"{Left}\" y=\"{H - Bottom + 14}\" font-size=\"10\">{Esc(Num(xLow))}</text>");
            sb.Append($"<text x=\"{W - Right}\" y=\"{H - Bottom + 14}\" font-size=\"10\" text-anchor=\"end\">{Esc(Num(xHigh))}</text>");
            sb.Append($"<text x=\"{(Left + W - Right) / 2}\" y=\"{H - 8}\" font-size=\"10\" text-anchor=\"middle\">{Esc(xLabel)}</text>");
        }
    }

    private static string End(StringBuilder sb) => sb.Append("</svg>").ToString();

    private static string F(double v) => v.ToString("0.##", CultureInfo.InvariantCulture);

    internal static string Num(double v) => Math.Abs(v) >= 100 ? v.ToString("0", CultureInfo.InvariantCulture)
        : Math.Abs(v) >= 1 ? v.ToString("0.##", CultureInfo.InvariantCulture) : v.ToString("0.###", CultureInfo.InvariantCulture);

    private static string Esc(string s) => WebUtility.HtmlEncode(s);
}
