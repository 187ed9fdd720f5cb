using System.Globalization;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Nifti;

/// <summary>
/// Runs <c>nifti_tool</c> (Debian nifti-bin, the NIfTI reference C library's tool) and parses the field tables
/// it prints for <c>-disp_hdr</c> / <c>-disp_nim</c> ("name offset nvals values…").
/// </summary>
internal static class NiftiTool
{
    public static string Run(params string[] args)
    {
        var (stdout, stderr) = ToolProcess.Checked("nifti_tool", "nifti-bin", args);
        return stdout + stderr;
    }

    /// <summary>Field name → the printed values (split on whitespace).</summary>
    public static Dictionary<string, string[]> Fields(string output)
    {
        var d = new Dictionary<string, string[]>(StringComparer.Ordinal);
        foreach (var raw in output.Split('\n'))
        {
            var parts = raw.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
            if (parts.Length < 3 || !int.TryParse(parts[1], out _) || !int.TryParse(parts[2], out _)) continue;
            d[parts[0]] = parts[3..];
        }
        return d;
    }

    public static double[] Numbers(Dictionary<string, string[]> fields, string name) =>
        fields[name].Select(s => double.Parse(s, CultureInfo.InvariantCulture)).ToArray();

    public static double Number(Dictionary<string, string[]> fields, string name) => Numbers(fields, name)[0];

    public static Dictionary<string, string[]> Header(string path) => Fields(Run("-disp_hdr", "-infiles", path));

    public static Dictionary<string, string[]> Image(string path) => Fields(Run("-disp_nim", "-infiles", path));
}
