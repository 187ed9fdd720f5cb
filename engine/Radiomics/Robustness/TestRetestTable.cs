using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>
/// The tidy test-retest feature table: a header naming the columns
/// <c>subject,repeat,family,feature,ibsiCode,aggregationCode,value</c> and optionally <c>region,image</c> (any order,
/// case-insensitive, extra columns ignored), then one feature value per line. <c>serimetry qa reproducibility
/// --radiomics-out</c> writes it; user test-retest data in the same shape is read the same way. Repeat labels are
/// free text (e.g. <c>r1</c>, <c>r2</c>); an empty value or <c>NA</c> is a missing value. Empty region and image
/// cells apply to every region and image.
/// </summary>
public static class TestRetestTable
{
    /// <summary>Column order written by <see cref="Write"/>.</summary>
    public const string Header = "subject,repeat,region,image,family,feature,ibsiCode,aggregationCode,value";

    /// <summary>Largest number of data lines accepted (2,000 features × 4 regions × 50 subjects × 3 repeats is 1.2 M).</summary>
    public const int MaxRows = 5_000_000;

    private static readonly string[] Required = ["subject", "repeat", "family", "feature", "ibsiCode", "aggregationCode", "value"];
    private static readonly string[] Optional = ["region", "image"];

    /// <summary>Reads a table file.</summary>
    public static IReadOnlyList<TestRetestValue> ReadFile(string path)
    {
        if (!File.Exists(path))
            throw new InputFormatException("file not found", path, $"give the path of a CSV with header {Header}");
        using var reader = new StreamReader(path);
        return Read(reader, Path.GetFileName(path));
    }

    /// <summary>Reads table text; <paramref name="where"/> names the source in error messages.</summary>
    public static IReadOnlyList<TestRetestValue> Read(TextReader reader, string where)
    {
        ArgumentNullException.ThrowIfNull(reader);
        var header = reader.ReadLine();
        while (header is not null && header.Trim().Length == 0) header = reader.ReadLine();
        if (header is null)
            throw new InputFormatException("the test-retest feature table is empty", where, $"add the header {Header} and data rows");
        var fields = TestRetestCsv.SplitLine(header.TrimStart('\uFEFF'), where, 1);
        var required = Required.Select(c => Column(fields, c, where, mustExist: true)).ToArray();
        var optional = Optional.Select(c => Column(fields, c, where, mustExist: false)).ToArray();
        var repeatIds = new Dictionary<string, int>(StringComparer.Ordinal);
        var rows = new List<TestRetestValue>();
        int lineNo = 1;
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            lineNo++;
            if (line.Trim().Length == 0) continue;
            if (rows.Count >= MaxRows)
                throw new InputLimitException($"more than {MaxRows:N0} rows", where, "split the table by region or family");
            var f = TestRetestCsv.SplitLine(line, where, lineNo);
            string at = $"{where} line {lineNo}";
            int needed = required.Concat(optional).Max() + 1;
            if (f.Count < needed)
                throw new InputFormatException($"expected at least {needed} fields, found {f.Count}", at, $"every row needs the columns {Header}");
            string subject = f[required[0]].Trim(), repeat = f[required[1]].Trim();
            if (subject.Length == 0) throw new InputFormatException("the subject cell is empty", at, "give every row a subject label");
            if (repeat.Length == 0) throw new InputFormatException("the repeat cell is empty", at, "give every row a repeat (session) label");
            if (!repeatIds.TryGetValue(repeat, out int r)) repeatIds[repeat] = r = repeatIds.Count;
            var feature = new FeatureValue(f[required[2]].Trim(), f[required[3]].Trim(), f[required[4]].Trim(), f[required[5]].Trim(),
                ParseValue(f[required[6]].Trim(), at));
            if (feature.Family.Length == 0 || feature.Feature.Length == 0)
                throw new InputFormatException("the family or feature cell is empty", at, "name the feature as features.csv does");
            rows.Add(new TestRetestValue(subject, r, feature, Cell(f, optional[0]), Cell(f, optional[1])));
        }
        if (rows.Count == 0)
            throw new InputFormatException("the test-retest feature table has a header but no data rows", where,
                "add one row per subject, repeat and feature");
        return rows;
    }

    /// <summary>Writes values with <see cref="Header"/>; <paramref name="repeatLabel"/> names repeat indices (default r1, r2 …).</summary>
    public static void Write(TextWriter writer, IEnumerable<TestRetestValue> values, Func<int, string>? repeatLabel = null)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(values);
        repeatLabel ??= r => "r" + (r + 1).ToString(CultureInfo.InvariantCulture);
        writer.Write(Header + "\n");
        foreach (var v in values)
        {
            var f = v.Feature;
            writer.Write(string.Join(',', RadiomicsCsv.Field(v.SubjectId), RadiomicsCsv.Field(repeatLabel(v.Repeat)), RadiomicsCsv.Field(v.Region), RadiomicsCsv.Field(v.Image),
                RadiomicsCsv.Field(f.Family), RadiomicsCsv.Field(f.Feature), RadiomicsCsv.Field(f.IbsiCode), RadiomicsCsv.Field(f.AggregationCode), RadiomicsCsv.Number(f.Value)));
            writer.Write('\n');
        }
    }

    private static int Column(List<string> fields, string name, string where, bool mustExist)
    {
        for (int i = 0; i < fields.Count; i++)
            if (string.Equals(fields[i].Trim(), name, StringComparison.OrdinalIgnoreCase)) return i;
        if (mustExist)
            throw new InputFormatException($"header lacks the column '{name}' (found: {string.Join(",", fields)})", $"{where} line 1",
                $"the header must name the columns {Header} (region and image may be left out)");
        return -1;
    }

    private static string Cell(List<string> f, int column) => column >= 0 ? f[column].Trim() : "";

    private static double ParseValue(string text, string at)
    {
        if (text.Length == 0 || text.Equals("NA", StringComparison.OrdinalIgnoreCase)) return double.NaN;
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw new InputFormatException($"value '{text}' is not a finite number", at,
                "use a decimal point and no units; leave the cell empty or write NA for a missing value");
        return v;
    }
}
