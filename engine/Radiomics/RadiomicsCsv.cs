using System.Globalization;

namespace Serimetry.Engine.Radiomics;

/// <summary>Cell formatting shared by the radiomics CSV files (RFC 4180 quoting; invariant round-trip numbers, NaN empty).</summary>
internal static class RadiomicsCsv
{
    public static string Field(string s) =>
        s.AsSpan().IndexOfAny(",\"\n\r") >= 0 ? "\"" + s.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : s;

    public static string Number(double v) => double.IsFinite(v) ? v.ToString("R", CultureInfo.InvariantCulture) : "";
}
