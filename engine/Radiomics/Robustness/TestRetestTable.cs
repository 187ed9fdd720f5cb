using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
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
        var csv = TidyCsvReader.Open(reader, where, Header, "the test-retest feature table is empty",
            $"add the header {Header} and data rows", MaxRows, "split the table by region or family");
        const string headerFix = $"the header must name the columns {Header} (region and image may be left out)";
        var required = Required.Select(c => csv.Column(c, required: true, headerFix)).ToArray();
        var optional = Optional.Select(c => csv.Column(c, required: false, headerFix)).ToArray();
        int needed = required.Concat(optional).Max() + 1;
        var repeatIds = new Dictionary<string, int>(StringComparer.Ordinal);
        var rows = new List<TestRetestValue>();
        while (csv.NextRow(needed))
        {
            string subject = csv.Label(required[0], "subject", "give every row a subject label");
            string repeat = csv.Label(required[1], "repeat", "give every row a repeat (session) label");
            if (!repeatIds.TryGetValue(repeat, out int r)) repeatIds[repeat] = r = repeatIds.Count;
            var feature = new FeatureValue(csv.Text(required[2]), csv.Text(required[3]), csv.Text(required[4]), csv.Text(required[5]),
                csv.Number(required[6], "use a decimal point and no units; leave the cell empty or write NA for a missing value"));
            if (feature.Family.Length == 0 || feature.Feature.Length == 0)
                throw new InputFormatException("the family or feature cell is empty", csv.At, "name the feature as features.csv does");
            rows.Add(new TestRetestValue(subject, r, feature, csv.Text(optional[0]), csv.Text(optional[1])));
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
}
