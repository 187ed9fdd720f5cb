using System.Diagnostics;
using System.Globalization;

namespace Serimetry.Conformance.Nifti;

/// <summary>
/// Runs <c>nifti_tool</c> (Debian nifti-bin, the NIfTI reference C library's tool) and parses the field tables
/// it prints for <c>-disp_hdr</c> / <c>-disp_nim</c> ("name offset nvals values…").
/// </summary>
internal static class NiftiTool
{
    public static string Run(params string[] args)
    {
        var psi = new ProcessStartInfo("nifti_tool") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in args) psi.ArgumentList.Add(a);
        Process p;
        try
        {
            p = Process.Start(psi) ?? throw new InvalidOperationException("nifti_tool did not start");
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            throw new InvalidOperationException("nifti_tool (Debian package nifti-bin) is required by this test; scripts/test.sh installs it", e);
        }
        using (p)
        {
            var stdoutTask = p.StandardOutput.ReadToEndAsync();
            var stderr = p.StandardError.ReadToEnd();
            if (!p.WaitForExit(60_000)) p.Kill();
            string stdout = stdoutTask.Result;
            if (p.ExitCode != 0) throw new InvalidOperationException($"nifti_tool {string.Join(' ', args)} failed ({p.ExitCode}): {stderr}");
            return stdout + stderr;
        }
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
