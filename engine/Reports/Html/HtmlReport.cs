using System.Globalization;
using System.Net;
using System.Text;
using Serimetry.Engine.Change;
using Serimetry.Engine.Reports.Pictures;

namespace Serimetry.Engine.Reports.Html;

/// <summary>A picture file of the report (relative to the report's folder).</summary>
/// <param name="Visit">Visit index.</param>
/// <param name="FileName">PNG file name.</param>
/// <param name="Caption">What it shows.</param>
public sealed record ReportPicture(int Visit, string FileName, string Caption);

/// <summary>Lesion ADC samples of one visit, for the histogram.</summary>
public sealed record VisitAdcSamples(int Visit, string Date, IReadOnlyList<double> Values);

/// <summary>
/// Renders <c>report.html</c>: the caution, a summary of key changes with their 95 % bands, pictures of
/// each visit with outlines, measures over time, ADC histograms, trends, comparability and alignment
/// quality. Self-contained apart from the PNG files beside it; no scripts.
/// </summary>
public static class HtmlReport
{
    /// <summary>Measures shown in the summary table and as plots, in this order.</summary>
    public static readonly string[] KeyMeasures =
    [
        "lesion.volume", "lesion.diameter.max", "lesion.adc.median", "lesion.adc.p10", "lesion.conspicuity.t2w",
        "lesion.conspicuity.adc", "gland.volume", "psa.density",
    ];

    private static readonly string[] Colours = ["#1f4e79", "#c55a11", "#548235", "#7030a0", "#bf9000", "#2e75b6"];

    public static string Render(ChangeReport report, IReadOnlyList<ReportPicture> pictures, IReadOnlyList<VisitAdcSamples> adc)
    {
        var sb = new StringBuilder();
        sb.Append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\"><title>Serimetry change report</title>");
        sb.Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
        sb.Append("<style>").Append(Css).Append("</style></head><body>");
        sb.Append("<h1>Serial MRI change report</h1>");
        sb.Append($"<p class=\"caution\">{E(report.Caution)}</p>");
        if (report.Partial)
        {
            sb.Append("<div class=\"partial\"><strong>Incomplete result.</strong> Some steps failed; the values below are partial.<ul>");
            foreach (var p in report.Problems) sb.Append($"<li>{E(p)}</li>");
            sb.Append("</ul></div>");
        }
        Visits(sb, report);
        Summary(sb, report);
        Pictures(sb, report, pictures);
        Plots(sb, report, adc);
        Trends(sb, report);
        Comparability(sb, report);
        Alignment(sb, report);
        sb.Append($"<footer>{E(report.Software.Name)} {E(report.Software.Version)} · change.json schema {E(report.SchemaVersion)} · repeatability profile: {E(report.Settings.RepeatabilityProfile)}</footer>");
        sb.Append("</body></html>");
        return sb.ToString();
    }

    private static void Visits(StringBuilder sb, ChangeReport r)
    {
        sb.Append("<h2>Visits</h2><table><tr><th>visit</th><th>date</th><th>role</th></tr>");
        foreach (var v in r.Visits)
            sb.Append($"<tr><td>{v.Index}</td><td>{E(v.Date)}</td><td>{(v.Index == 0 ? "baseline" : "follow-up")}</td></tr>");
        sb.Append("</table>");
    }

    private static void Summary(StringBuilder sb, ChangeReport r)
    {
        sb.Append("<h2>Change against baseline</h2>");
        sb.Append("<p class=\"note\">Each change carries a 95 % band built from the repeatability profile; ");
        sb.Append("<span class=\"flag\">beyond noise</span> marks a band that excludes zero change.</p>");
        sb.Append("<table><tr><th>measure</th><th>unit</th><th>baseline</th><th>visit</th><th>value</th><th>change</th><th>95 % band of change</th><th>beyond noise</th></tr>");
        foreach (var id in KeyMeasures)
        {
            foreach (var c in r.Changes.Where(c => c.Measure == id && c.FromVisit == 0))
            {
                string band = c.Ci95 is { Length: 2 } b ? $"{N(b[0])} to {N(b[1])}" : "no repeatability entry";
                string rel = c.RelativeDelta is double rd ? $" ({rd * 100:+0;-0;0} %)" : "";
                string noise = c.ExceedsNoise switch { true => "<span class=\"flag\">yes</span>", false => "no", _ => "n/a" };
                sb.Append($"<tr><td>{E(id)}</td><td>{E(c.Unit)}</td><td>{N(c.Baseline)}</td><td>{c.ToVisit}</td><td>{N(c.Followup)}</td>");
                sb.Append($"<td>{N(c.Delta)}{rel}</td><td>{band}</td><td>{noise}</td></tr>");
            }
        }
        sb.Append("</table>");
    }

    private static void Pictures(StringBuilder sb, ChangeReport r, IReadOnlyList<ReportPicture> pictures)
    {
        if (pictures.Count == 0) return;
        sb.Append("<h2>Outlines on each visit</h2>");
        sb.Append("<p class=\"note\"><span style=\"color:#e8c000\">yellow</span>: baseline outline carried to the visit; ");
        sb.Append("<span style=\"color:#ff3030\">red</span>: lesion re-fitted on the visit's own images; ");
        sb.Append("<span style=\"color:#30c0ff\">blue</span>: gland.</p><div class=\"pics\">");
        foreach (var p in pictures.OrderBy(p => p.Visit))
            sb.Append($"<figure><img src=\"{E(p.FileName)}\" alt=\"{E(p.Caption)}\"><figcaption>{E(p.Caption)}</figcaption></figure>");
        sb.Append("</div>");
    }

    private static void Plots(StringBuilder sb, ChangeReport r, IReadOnlyList<VisitAdcSamples> adc)
    {
        sb.Append("<h2>Measures over time</h2><div class=\"pics\">");
        var baseDate = ParseDate(r.Visits[0].Date);
        foreach (var id in KeyMeasures)
        {
            var points = new List<TimePoint>();
            foreach (var v in r.Visits)
            {
                if (!v.Values.TryGetValue(id, out var val) || val.Value is not double y) continue;
                var ch = r.Changes.FirstOrDefault(c => c.Measure == id && c.FromVisit == 0 && c.ToVisit == v.Index);
                double? lo = ch?.Ci95 is { Length: 2 } b ? ch.Baseline + b[0] : null;
                double? hi = ch?.Ci95 is { Length: 2 } b2 ? ch.Baseline + b2[1] : null;
                double years = (ParseDate(v.Date).DayNumber - baseDate.DayNumber) / 365.25;
                points.Add(new TimePoint(years, v.Date, y, lo, hi));
            }
            if (points.Count > 0)
                sb.Append("<figure>").Append(SvgChart.MeasureOverTime(id, UnitOf(r, id), points)).Append("</figure>");
        }
        var series = adc.Where(a => a.Values.Count > 0)
            .Select(a => new HistogramSeries($"visit {a.Visit} ({a.Date})", a.Values, Colours[a.Visit % Colours.Length])).ToList();
        if (series.Count > 0)
            sb.Append("<figure>").Append(SvgChart.Histograms("lesion ADC histogram", "ADC (10^-6 mm²/s)", series)).Append("</figure>");
        sb.Append("</div>");
        if (r.HistogramDistances.Count > 0)
        {
            sb.Append("<table><tr><th>ADC distribution</th><th>from</th><th>to</th><th>Wasserstein-1</th><th>Kolmogorov-Smirnov</th></tr>");
            foreach (var h in r.HistogramDistances)
                sb.Append($"<tr><td>{E(h.Measure)}</td><td>{h.FromVisit}</td><td>{h.ToVisit}</td><td>{N(h.Wasserstein1)}</td><td>{N(h.KolmogorovSmirnov)}</td></tr>");
            sb.Append("</table>");
        }
    }

    private static void Trends(StringBuilder sb, ChangeReport r)
    {
        if (r.Trends.Count == 0) return;
        sb.Append("<h2>Trends over all visits</h2><table><tr><th>measure</th><th>slope per year</th><th>95 % CI</th><th>doubling time (years)</th><th>visits</th><th>method</th></tr>");
        foreach (var t in r.Trends)
        {
            string ci = t.Ci95 is { Length: 2 } c ? $"{N(c[0])} to {N(c[1])}" : "";
            string dt = t.DoublingTimeYears is double d ? N(d) : t.HalvingTimeYears is double h ? $"halving {N(h)}" : "";
            sb.Append($"<tr><td>{E(t.Measure)}</td><td>{N(t.SlopePerYear)} {E(t.SlopeUnit)}</td><td>{ci}</td><td>{dt}</td><td>{t.NVisits}</td><td>{E(t.Method)}</td></tr>");
        }
        sb.Append("</table>");
    }

    private static void Comparability(StringBuilder sb, ChangeReport r)
    {
        sb.Append("<h2>Comparability of the exams</h2>");
        if (r.Comparability.Count == 0)
        {
            sb.Append("<p>No acquisition difference was found between the exams.</p>");
            return;
        }
        sb.Append("<table><tr><th>from</th><th>to</th><th>item</th><th>baseline</th><th>follow-up</th><th>severity</th><th>meaning</th></tr>");
        foreach (var c in r.Comparability)
            sb.Append($"<tr class=\"{c.Severity.ToString().ToLowerInvariant()}\"><td>{c.FromVisit}</td><td>{c.ToVisit}</td><td>{E(c.Item)}</td><td>{E(c.Baseline ?? "")}</td><td>{E(c.Followup ?? "")}</td><td>{c.Severity}</td><td>{E(c.Message)}</td></tr>");
        sb.Append("</table>");
    }

    private static void Alignment(StringBuilder sb, ChangeReport r)
    {
        sb.Append("<h2>Alignment and outline quality</h2><table><tr><th>visit</th><th>transform</th><th>metric before</th><th>metric after</th><th>re-fit Dice vs carried outline</th><th>centroid shift (mm)</th><th>notes</th></tr>");
        foreach (var v in r.Visits)
        {
            var reg = v.Registration;
            var notes = reg.Flags.Concat(v.LesionRefit?.Flags ?? []).Concat(v.Flags);
            sb.Append($"<tr><td>{v.Index}</td><td>{E(reg.Transform.Kind)}</td><td>{NO(reg.MetricBefore)}</td><td>{NO(reg.MetricAfter)}</td>");
            sb.Append($"<td>{NO(v.LesionRefit?.Dice)}</td><td>{NO(v.LesionRefit?.CentroidShiftMm)}</td><td>{E(string.Join("; ", notes))}</td></tr>");
        }
        sb.Append("</table>");
    }

    private static string UnitOf(ChangeReport r, string id) =>
        r.Visits.SelectMany(v => v.Values).FirstOrDefault(p => p.Key == id).Value?.Unit ?? "";

    private static DateOnly ParseDate(string s) => DateOnly.ParseExact(s, "yyyy-MM-dd", CultureInfo.InvariantCulture);

    private static string N(double v) => double.IsFinite(v) ? SvgChart.Num(v) : "n/a";

    private static string NO(double? v) => v is double d ? N(d) : "";

    private static string E(string s) => WebUtility.HtmlEncode(s);

    private const string Css =
        "body{font-family:system-ui,-apple-system,'Segoe UI',sans-serif;margin:24px auto;max-width:1100px;color:#222;line-height:1.4}" +
        "h1{font-size:22px;margin-bottom:4px}h2{font-size:17px;border-bottom:1px solid #ccc;padding-bottom:3px;margin-top:28px}" +
        "table{border-collapse:collapse;font-size:13px;margin:8px 0}td,th{border:1px solid #ddd;padding:3px 8px;text-align:left}" +
        "th{background:#f2f4f7}.caution{background:#fff8e1;border:1px solid #e0c060;padding:8px 12px}" +
        ".partial{background:#fdecea;border:1px solid #d9534f;padding:8px 12px}.flag{color:#b00020;font-weight:bold}" +
        ".note{font-size:13px;color:#444}.pics{display:flex;flex-wrap:wrap;gap:12px}figure{margin:0}" +
        "figcaption{font-size:12px;color:#444}img{image-rendering:pixelated;border:1px solid #999}" +
        "tr.warning td{background:#fff8e1}tr.critical td{background:#fdecea}footer{margin-top:30px;font-size:12px;color:#666}";
}
