using System.Globalization;
using System.Text;
using Serimetry.Engine.Io.Dicom.Codecs;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Codecs;

/// <summary>Rows of shared/reference/dicom/manifest.csv (values decoded by dcmtk and GDCM), by file name.</summary>
internal static class ReferenceManifest
{
    private static readonly Lazy<Dictionary<string, Dictionary<string, string>>> Rows = new(Load);

    public static Dictionary<string, string> Row(string file) => Rows.Value[file];

    public static string FilePath(string file) => SharedReference.PathOf("dicom", "files", file);

    public static int Int(this Dictionary<string, string> row, string column, int fallback = 0) =>
        string.IsNullOrEmpty(row[column]) ? fallback : int.Parse(row[column], CultureInfo.InvariantCulture);

    public static FrameInfo Info(this Dictionary<string, string> row) => new(row.Int("rows"), row.Int("columns"),
        row.Int("samples_per_pixel"), row.Int("bits_allocated"), row.Int("bits_stored"), row.Int("pixel_representation"),
        row.Int("planar_configuration"));

    private static Dictionary<string, Dictionary<string, string>> Load()
    {
        var lines = File.ReadAllLines(SharedReference.PathOf("dicom", "manifest.csv"));
        var header = Split(lines[0]);
        var result = new Dictionary<string, Dictionary<string, string>>();
        foreach (var line in lines.Skip(1))
        {
            var cells = Split(line);
            var row = new Dictionary<string, string>();
            for (int i = 0; i < header.Count; i++) row[header[i]] = i < cells.Count ? cells[i] : "";
            result[row["file"]] = row;
        }
        return result;
    }

    private static List<string> Split(string line)
    {
        var cells = new List<string>();
        var cell = new StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            char ch = line[i];
            if (quoted && ch == '"' && i + 1 < line.Length && line[i + 1] == '"') { cell.Append('"'); i++; }
            else if (ch == '"') quoted = !quoted;
            else if (ch == ',' && !quoted) { cells.Add(cell.ToString()); cell.Clear(); }
            else cell.Append(ch);
        }
        cells.Add(cell.ToString());
        return cells;
    }
}
