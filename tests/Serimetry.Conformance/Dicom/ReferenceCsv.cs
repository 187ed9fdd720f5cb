using System.Text;

namespace Serimetry.Conformance.Dicom;

/// <summary>Reads the reference CSV files (RFC 4180 quoting) into rows keyed by column name.</summary>
internal static class ReferenceCsv
{
    public static IReadOnlyList<IReadOnlyDictionary<string, string>> Read(string path)
    {
        var lines = ParseRecords(File.ReadAllText(path));
        var header = lines[0];
        var rows = new List<IReadOnlyDictionary<string, string>>();
        foreach (var rec in lines.Skip(1))
        {
            if (rec.Count == 1 && rec[0].Length == 0) continue;
            var d = new Dictionary<string, string>();
            for (var i = 0; i < header.Count; i++) d[header[i]] = i < rec.Count ? rec[i] : "";
            rows.Add(d);
        }
        return rows;
    }

    private static List<List<string>> ParseRecords(string text)
    {
        var records = new List<List<string>>();
        var fields = new List<string>();
        var sb = new StringBuilder();
        var quoted = false;
        for (var i = 0; i < text.Length; i++)
        {
            var c = text[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < text.Length && text[i + 1] == '"') { sb.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else sb.Append(c);
                continue;
            }
            switch (c)
            {
                case '"': quoted = true; break;
                case ',': fields.Add(sb.ToString()); sb.Clear(); break;
                case '\r': break;
                case '\n': fields.Add(sb.ToString()); sb.Clear(); records.Add(fields); fields = []; break;
                default: sb.Append(c); break;
            }
        }
        if (sb.Length > 0 || fields.Count > 0) { fields.Add(sb.ToString()); records.Add(fields); }
        return records;
    }
}
