using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Repeatability;

/// <summary>
/// Reads the tidy test-retest CSV: a header naming the columns <c>subject,measure,repeat,value</c>
/// (any order, case-insensitive, extra columns ignored), then one observation per line. Fields may be
/// double-quoted. An empty value or <c>NA</c> is a missing repeat (kept as NaN and reported by the
/// analysis); any other non-numeric value, an empty label or a short line is an error naming the line.
/// </summary>
public static class TestRetestCsv
{
    /// <summary>Largest number of data lines accepted (a QA table has hundreds, not millions).</summary>
    public const int MaxRows = 1_000_000;

    private static readonly string[] Columns = ["subject", "measure", "repeat", "value"];

    /// <summary>Reads a CSV file.</summary>
    public static IReadOnlyList<RepeatabilityObservation> ReadFile(string path)
    {
        if (!File.Exists(path))
            throw new InputFormatException("file not found", path, "give the path of a CSV with header subject,measure,repeat,value");
        using var reader = new StreamReader(path);
        return Read(reader, Path.GetFileName(path));
    }

    /// <summary>Reads CSV text; <paramref name="where"/> names the source in error messages.</summary>
    public static IReadOnlyList<RepeatabilityObservation> Read(TextReader reader, string where)
    {
        var header = reader.ReadLine();
        while (header is not null && header.Trim().Length == 0) header = reader.ReadLine();
        if (header is null)
            throw new InputFormatException("the table is empty", where, "add a header line subject,measure,repeat,value and data rows");
        var index = MapHeader(SplitLine(header.TrimStart('\uFEFF'), where, 1), where);
        var rows = new List<RepeatabilityObservation>();
        int lineNo = 1;
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            lineNo++;
            if (line.Trim().Length == 0) continue;
            if (rows.Count >= MaxRows)
                throw new InputLimitException($"more than {MaxRows:N0} rows", where, "split the table by measure");
            rows.Add(ParseRow(SplitLine(line, where, lineNo), index, where, lineNo));
        }
        if (rows.Count == 0)
            throw new InputFormatException("the table has a header but no data rows", where, "add one row per subject, measure and repeat");
        return rows;
    }

    private static int[] MapHeader(IReadOnlyList<string> fields, string where)
    {
        var index = new int[Columns.Length];
        for (int c = 0; c < Columns.Length; c++)
        {
            index[c] = -1;
            for (int f = 0; f < fields.Count; f++)
                if (string.Equals(fields[f].Trim(), Columns[c], StringComparison.OrdinalIgnoreCase)) index[c] = f;
            if (index[c] < 0)
                throw new InputFormatException(
                    $"header lacks the column '{Columns[c]}' (found: {string.Join(",", fields)})", $"{where} line 1",
                    "the header must name the columns subject,measure,repeat,value");
        }
        return index;
    }

    private static RepeatabilityObservation ParseRow(IReadOnlyList<string> fields, int[] index, string where, int lineNo)
    {
        string at = $"{where} line {lineNo}";
        int needed = index.Max() + 1;
        if (fields.Count < needed)
            throw new InputFormatException($"expected at least {needed} fields, found {fields.Count}", at, "every row needs subject, measure, repeat and value");
        string subject = fields[index[0]].Trim(), measure = fields[index[1]].Trim(), repeat = fields[index[2]].Trim();
        if (subject.Length == 0) throw new InputFormatException("the subject cell is empty", at, "give every row a subject label");
        if (measure.Length == 0) throw new InputFormatException("the measure cell is empty", at, "give every row a measure id");
        if (repeat.Length == 0) throw new InputFormatException("the repeat cell is empty", at, "give every row a repeat (session or rater) label");
        return new RepeatabilityObservation(subject, measure, repeat, ParseValue(fields[index[3]].Trim(), at));
    }

    private static double ParseValue(string text, string at)
    {
        if (text.Length == 0 || text.Equals("NA", StringComparison.OrdinalIgnoreCase)) return double.NaN;
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw new InputFormatException($"value '{text}' is not a finite number", at,
                "use a decimal point, no units or thousands separators; leave the cell empty or write NA for a missing repeat");
        return v;
    }

    /// <summary>Splits one CSV line on commas, honouring double quotes ("" inside quotes is a quote).</summary>
    internal static List<string> SplitLine(string line, string where, int lineNo)
    {
        var fields = new List<string>();
        var current = new System.Text.StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            char ch = line[i];
            if (quoted)
            {
                if (ch == '"' && i + 1 < line.Length && line[i + 1] == '"') { current.Append('"'); i++; }
                else if (ch == '"') quoted = false;
                else current.Append(ch);
            }
            else if (ch == '"') quoted = true;
            else if (ch == ',') { fields.Add(current.ToString()); current.Clear(); }
            else current.Append(ch);
        }
        if (quoted) throw new InputFormatException("unterminated double quote", $"{where} line {lineNo}", "close every quoted field");
        fields.Add(current.ToString());
        return fields;
    }
}
