using System.ComponentModel;
using System.Diagnostics;

namespace Serimetry.Conformance.DicomOut;

/// <summary>
/// Runs dicom3tools' <c>dciodvfy</c> (an independent IOD validator) and splits its report into errors and
/// warnings; its exit code does not signal findings, so the lines are read.
/// </summary>
internal static class Dciodvfy
{
    public static (IReadOnlyList<string> Errors, IReadOnlyList<string> Warnings) Check(string path)
    {
        var psi = new ProcessStartInfo("dciodvfy") { RedirectStandardError = true, RedirectStandardOutput = true };
        psi.ArgumentList.Add(path);
        Process p;
        try
        {
            p = Process.Start(psi) ?? throw new InvalidOperationException("dciodvfy did not start");
        }
        catch (Win32Exception ex)
        {
            throw new InvalidOperationException($"dciodvfy is not installed ({ex.Message}); scripts/test.sh installs dicom3tools", ex);
        }
        using (p)
        {
            var err = p.StandardError.ReadToEndAsync();
            var output = p.StandardOutput.ReadToEndAsync();
            if (!p.WaitForExit(120_000))
            {
                p.Kill(true);
                throw new TimeoutException("dciodvfy did not finish within 120 s");
            }
            var lines = (output.Result + "\n" + err.Result).Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            return (lines.Where(l => l.StartsWith("Error", StringComparison.Ordinal)).ToList(),
                lines.Where(l => l.StartsWith("Warning", StringComparison.Ordinal)).ToList());
        }
    }
}
