using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Radiomics;

/// <summary>
/// The IBSI chapter 1 digital phantom (Src: theibsi/data_sets, ibsi_1_digital_phantom, CC BY 4.0) read
/// from the plain-text voxel list in shared/reference, and the IBSI reference values (Src: IBSI chapter 1
/// reference values, Zwanenburg et al. Radiology 2020; ibsi-doc 03_Image_features.rst) as rows.
/// </summary>
internal static class IbsiPhantom
{
    public static (Volume<float> Image, Volume<byte> Mask) Load()
    {
        var lines = File.ReadAllLines(SharedReference.PathOf("ibsi", "digital_phantom", "phantom_voxels.csv"));
        // 5 × 4 × 4 voxels of 2 mm (NIfTI pixdim); NIfTI diag(−2, −2, 2) is the identity direction in LPS.
        var geometry = Geometry.Axial(new Size3(5, 4, 4), new Vec3(2, 2, 2), new Vec3(0, 0, 0));
        var image = new Volume<float>(geometry);
        var mask = new Volume<byte>(geometry);
        foreach (var line in lines.Skip(1))
        {
            var f = line.Split(',');
            int i = int.Parse(f[0], CultureInfo.InvariantCulture), j = int.Parse(f[1], CultureInfo.InvariantCulture), k = int.Parse(f[2], CultureInfo.InvariantCulture);
            image[i, j, k] = float.Parse(f[3], CultureInfo.InvariantCulture);
            mask[i, j, k] = byte.Parse(f[4], CultureInfo.InvariantCulture);
        }
        return (image, mask);
    }

    public sealed record Row(string Family, string Feature, string Code, string Aggregation, string AggregationCode,
        string ReferenceText, double Reference, double Tolerance)
    {
        /// <summary>
        /// The aggregation code the engine writes for this row: IBSI's tables label the whole-volume (non-texture)
        /// rows DHQ4, while features.csv leaves aggregationCode empty for them (IBSI: aggregation applies to texture).
        /// </summary>
        public string EngineAggregationCode =>
            AggregationCode == Serimetry.Engine.Radiomics.IbsiAggregation.VolumeReferenceCode ? Serimetry.Engine.Radiomics.IbsiAggregation.None : AggregationCode;

        /// <summary>
        /// IBSI rule for the phantom: within the tolerance when one is given; otherwise equal after rounding to
        /// the published significant digits (IBSI rounded contributions to 3 significant digits).
        /// </summary>
        public bool Accepts(double value)
        {
            if (!double.IsFinite(value)) return false;
            if (Tolerance > 0) return Math.Abs(value - Reference) <= Tolerance + 1e-12;
            int digits = Math.Max(3, SignificantDigits(ReferenceText));
            return Math.Abs(RoundSignificant(value, digits) - Reference) <= 1e-9 * Math.Max(1, Math.Abs(Reference));
        }

        private static int SignificantDigits(string text)
        {
            var mantissa = text.Split('e', 'E')[0].TrimStart('-').Replace(".", "", StringComparison.Ordinal).TrimStart('0');
            return Math.Max(1, mantissa.Length);
        }

        private static double RoundSignificant(double v, int digits)
        {
            if (v == 0) return 0;
            double scale = Math.Pow(10, digits - 1 - (int)Math.Floor(Math.Log10(Math.Abs(v))));
            return Math.Round(v * scale, MidpointRounding.AwayFromZero) / scale;
        }
    }

    /// <summary>Reference rows that carry a value (IBSI gives none for 5 features; those are skipped).</summary>
    public static IReadOnlyList<Row> ReferenceRows()
    {
        var rows = new List<Row>();
        foreach (var line in File.ReadAllLines(SharedReference.PathOf("ibsi", "reference_values", "ibsi1_digital_phantom_reference_values.csv")).Skip(1))
        {
            var f = SplitCsv(line);
            if (f[6].Length == 0) continue;
            rows.Add(new Row(f[0], f[2], f[3], f[4], f[5], f[6],
                double.Parse(f[6], CultureInfo.InvariantCulture), double.Parse(f[7], CultureInfo.InvariantCulture)));
        }
        return rows;
    }

    private static List<string> SplitCsv(string line)
    {
        var fields = new List<string>();
        var current = new System.Text.StringBuilder();
        bool quoted = false;
        foreach (char c in line)
        {
            if (c == '"') quoted = !quoted;
            else if (c == ',' && !quoted) { fields.Add(current.ToString()); current.Clear(); }
            else current.Append(c);
        }
        fields.Add(current.ToString());
        return fields;
    }
}
