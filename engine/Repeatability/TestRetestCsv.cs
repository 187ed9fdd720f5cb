using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

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

    private const string Header = "subject,measure,repeat,value";
    private static readonly string[] Columns = ["subject", "measure", "repeat", "value"];

    /// <summary>Reads a CSV file.</summary>
    public static IReadOnlyList<RepeatabilityObservation> ReadFile(string path)
    {
        if (!File.Exists(path))
            throw new InputFormatException("file not found", path, $"give the path of a CSV with header {Header}");
        using var reader = new StreamReader(path);
        return Read(reader, Path.GetFileName(path));
    }

    /// <summary>Reads CSV text; <paramref name="where"/> names the source in error messages.</summary>
    public static IReadOnlyList<RepeatabilityObservation> Read(TextReader reader, string where)
    {
        var csv = TidyCsvReader.Open(reader, where, Header, "the table is empty",
            $"add a header line {Header} and data rows", MaxRows, "split the table by measure");
        var index = Columns.Select(c => csv.Column(c, required: true, $"the header must name the columns {Header}")).ToArray();
        int needed = index.Max() + 1;
        var rows = new List<RepeatabilityObservation>();
        while (csv.NextRow(needed))
        {
            string subject = csv.Label(index[0], "subject", "give every row a subject label");
            string measure = csv.Label(index[1], "measure", "give every row a measure id");
            string repeat = csv.Label(index[2], "repeat", "give every row a repeat (session or rater) label");
            rows.Add(new RepeatabilityObservation(subject, measure, repeat, csv.Number(index[3],
                "use a decimal point, no units or thousands separators; leave the cell empty or write NA for a missing repeat")));
        }
        if (rows.Count == 0)
            throw new InputFormatException("the table has a header but no data rows", where, "add one row per subject, measure and repeat");
        return rows;
    }
}
