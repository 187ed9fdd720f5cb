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
            writer.Write(string.Join(',', RadiomicsCsv.Field(f.Family), RadiomicsCsv.Field(f.Feature), RadiomicsCsv.Field(f.IbsiCode),
                RadiomicsCsv.Field(f.AggregationCode), RadiomicsCsv.Number(f.Value)));
            writer.Write('\n');
        }
    }

    public static string ToCsv(IEnumerable<FeatureValue> features)
    {
        var sb = new StringWriter(new StringBuilder(), CultureInfo.InvariantCulture);
        Write(sb, features);
        return sb.ToString();
    }
}
