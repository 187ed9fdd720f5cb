using System.Globalization;
using System.Text;

namespace Serimetry.Engine.Reports;

/// <summary>
/// Tidy CSV tables for research (one observation per row, RFC 4180 quoting, invariant culture, round-trip
/// numbers, empty cell for a missing value): <c>measures.csv</c> and <c>changes.csv</c>.
/// </summary>
public static class TidyCsv
{
    /// <summary>Header of measures.csv.</summary>
    public const string MeasuresHeader = "visit,date,measure,value,unit,status,reason";

    /// <summary>Header of changes.csv.</summary>
    public const string ChangesHeader = "measure,unit,fromVisit,toVisit,baseline,followup,delta,relativeDelta,ci95Low,ci95High,repeatabilityCoefficient,repeatabilitySource,exceedsNoise,direction";

    /// <summary>measures.csv: one row per visit and measure, measures in id order.</summary>
    public static string Measures(ChangeReport report)
    {
        var sb = new StringBuilder(MeasuresHeader).Append('\n');
        foreach (var v in report.Visits)
            foreach (var (id, value) in v.Values.OrderBy(p => p.Key, StringComparer.Ordinal))
                Row(sb, I(v.Index), v.Date, id, N(value.Value), value.Unit, value.Status, value.Reason);
        return sb.ToString();
    }

    /// <summary>changes.csv: one row per change in report order.</summary>
    public static string Changes(ChangeReport report)
    {
        var sb = new StringBuilder(ChangesHeader).Append('\n');
        foreach (var c in report.Changes)
            Row(sb, c.Measure, c.Unit, I(c.FromVisit), I(c.ToVisit), N(c.Baseline), N(c.Followup), N(c.Delta), N(c.RelativeDelta),
                N(c.Ci95?[0]), N(c.Ci95?[1]), N(c.RepeatabilityCoefficient), c.RepeatabilitySource,
                c.ExceedsNoise is bool b ? (b ? "true" : "false") : "", c.Direction.ToString().ToLowerInvariant());
        return sb.ToString();
    }

    /// <summary>Writes both tables into <paramref name="folder"/>.</summary>
    public static void WriteAll(ChangeReport report, string folder)
    {
        File.WriteAllText(Path.Combine(folder, "measures.csv"), Measures(report));
        File.WriteAllText(Path.Combine(folder, "changes.csv"), Changes(report));
    }

    private static void Row(StringBuilder sb, params string?[] cells)
    {
        for (int i = 0; i < cells.Length; i++)
        {
            if (i > 0) sb.Append(',');
            sb.Append(Quote(cells[i] ?? ""));
        }
        sb.Append('\n');
    }

    internal static string Quote(string s) =>
        s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;

    private static string I(int v) => v.ToString(CultureInfo.InvariantCulture);

    private static string N(double? v) => v is double d && double.IsFinite(d) ? d.ToString("R", CultureInfo.InvariantCulture) : "";
}
