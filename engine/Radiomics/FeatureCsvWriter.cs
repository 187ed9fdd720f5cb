using System.Globalization;
using System.Text;

namespace Serimetry.Engine.Radiomics;

/// <summary>
/// Writes features as tidy CSV (RFC 4180), one row per value: <c>family,feature,ibsiCode,aggregationCode,value</c>.
/// Values use invariant culture and round-trip precision ("R"); NaN is written as an empty cell.
/// </summary>
public static class FeatureCsvWriter
{
    public const string Header = "family,feature,ibsiCode,aggregationCode,value";

    public static void Write(TextWriter writer, IEnumerable<FeatureValue> features)
    {
        ArgumentNullException.ThrowIfNull(writer);
        writer.Write(Header);
        writer.Write('\n');
        foreach (var f in features)
        {
            writer.Write(Quote(f.Family)); writer.Write(',');
            writer.Write(Quote(f.Feature)); writer.Write(',');
            writer.Write(Quote(f.IbsiCode)); writer.Write(',');
            writer.Write(Quote(f.AggregationCode)); writer.Write(',');
            if (double.IsFinite(f.Value)) writer.Write(f.Value.ToString("R", CultureInfo.InvariantCulture));
            writer.Write('\n');
        }
    }

    public static string ToCsv(IEnumerable<FeatureValue> features)
    {
        var sb = new StringWriter(new StringBuilder(), CultureInfo.InvariantCulture);
        Write(sb, features);
        return sb.ToString();
    }

    private static string Quote(string s) =>
        s.AsSpan().IndexOfAny(",\"\n\r") >= 0 ? "\"" + s.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : s;
}
