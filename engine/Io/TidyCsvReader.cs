using System.Globalization;
using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io;

/// <summary>
/// Reads a tidy CSV table row by row: a header line naming the columns (any order, case-insensitive, extra
/// columns ignored; a leading byte-order mark and blank lines are skipped), then one record per line. Fields may
/// be double-quoted (<c>""</c> inside quotes is a quote). Every error is an <see cref="InputFormatException"/>
/// naming the source and line; a table longer than the row limit is an <see cref="InputLimitException"/>.
/// </summary>
internal sealed class TidyCsvReader(TextReader reader, string where, List<string> header, string expectedHeader, int maxRows, string limitFix)
{
    private List<string> _fields = [];
    private int _lineNo = 1;
    private int _rows;

    /// <summary>Where the current row stands, for error messages: "<c>source line N</c>".</summary>
    public string At => $"{where} line {_lineNo}";

    /// <summary>
    /// Reads the header. <paramref name="emptyMessage"/> and <paramref name="emptyFix"/> describe a table with no
    /// header; <paramref name="expectedHeader"/> is named when a row is short; more than <paramref name="maxRows"/> data
    /// lines is an error whose fix is <paramref name="limitFix"/>.
    /// </summary>
    public static TidyCsvReader Open(TextReader reader, string where, string expectedHeader, string emptyMessage, string emptyFix,
        int maxRows, string limitFix)
    {
        ArgumentNullException.ThrowIfNull(reader);
        var first = reader.ReadLine();
        while (first is not null && first.Trim().Length == 0) first = reader.ReadLine();
        if (first is null)
            throw new InputFormatException(emptyMessage, where, emptyFix);
        return new TidyCsvReader(reader, where, SplitLine(first.TrimStart('\uFEFF'), $"{where} line 1"), expectedHeader, maxRows, limitFix);
    }

    /// <summary>Index of the first header column named <paramref name="name"/>; a required one that is missing is an error, an optional one is -1.</summary>
    public int Column(string name, bool required, string fix)
    {
        for (int i = 0; i < header.Count; i++)
            if (string.Equals(header[i].Trim(), name, StringComparison.OrdinalIgnoreCase)) return i;
        if (required)
            throw new InputFormatException($"header lacks the column '{name}' (found: {string.Join(",", header)})", $"{where} line 1", fix);
        return -1;
    }

    /// <summary>
    /// Moves to the next non-blank line, checking it has at least <paramref name="fieldsNeeded"/> fields;
    /// false at the end of the table.
    /// </summary>
    public bool NextRow(int fieldsNeeded)
    {
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            _lineNo++;
            if (line.Trim().Length == 0) continue;
            if (_rows >= maxRows)
                throw new InputLimitException($"more than {maxRows:N0} rows", where, limitFix);
            _rows++;
            _fields = SplitLine(line, At);
            if (_fields.Count < fieldsNeeded)
                throw new InputFormatException($"expected at least {fieldsNeeded} fields, found {_fields.Count}", At,
                    $"every row needs the columns {expectedHeader}");
            return true;
        }
        return false;
    }

    /// <summary>The trimmed cell of <paramref name="column"/> in the current row; "" for a column the header lacks (-1).</summary>
    public string Text(int column) => column >= 0 ? _fields[column].Trim() : "";

    /// <summary>The trimmed cell, which must not be empty: <paramref name="what"/> names it in the error.</summary>
    public string Label(int column, string what, string fix)
    {
        string text = Text(column);
        if (text.Length == 0) throw new InputFormatException($"the {what} cell is empty", At, fix);
        return text;
    }

    /// <summary>
    /// The cell as a finite invariant-culture number; an empty cell or <c>NA</c> is a missing value (NaN).
    /// </summary>
    public double Number(int column, string fix)
    {
        string text = Text(column);
        if (text.Length == 0 || text.Equals("NA", StringComparison.OrdinalIgnoreCase)) return double.NaN;
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw new InputFormatException($"value '{text}' is not a finite number", At, fix);
        return v;
    }

    /// <summary>Splits one CSV line on commas, honouring double quotes; <paramref name="at"/> names the line.</summary>
    private static List<string> SplitLine(string line, string at)
    {
        var fields = new List<string>();
        var current = new StringBuilder();
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
        if (quoted) throw new InputFormatException("unterminated double quote", at, "close every quoted field");
        fields.Add(current.ToString());
        return fields;
    }
}
