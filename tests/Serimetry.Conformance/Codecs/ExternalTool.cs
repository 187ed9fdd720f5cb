using System.Diagnostics;
using System.Text;

namespace Serimetry.Conformance.Codecs;

/// <summary>Runs a reference tool (dcmtk, GDCM, pvrg-jpeg) and fails the test with its output when it fails.</summary>
internal static class ExternalTool
{
    public static void Run(string exe, params string[] args)
    {
        var start = new ProcessStartInfo(exe) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in args) start.ArgumentList.Add(a);
        Process process;
        try
        {
            process = Process.Start(start) ?? throw new InvalidOperationException(exe + " did not start");
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            throw new InvalidOperationException($"{exe} is not installed (scripts/test.sh installs dcmtk, libgdcm-tools and pvrg-jpeg)", e);
        }
        using (process)
        {
            var output = new StringBuilder();
            process.OutputDataReceived += (_, e) => output.AppendLine(e.Data);
            process.ErrorDataReceived += (_, e) => output.AppendLine(e.Data);
            process.BeginOutputReadLine();
            process.BeginErrorReadLine();
            if (!process.WaitForExit(120_000))
            {
                process.Kill(entireProcessTree: true);
                throw new TimeoutException($"{exe} {string.Join(' ', args)} did not finish in 120 s");
            }
            process.WaitForExit();
            if (process.ExitCode != 0)
                throw new InvalidOperationException($"{exe} {string.Join(' ', args)} exited with {process.ExitCode}: {output}");
        }
    }

    /// <summary>A fresh scratch folder under the system temp folder; delete it with <see cref="Directory.Delete(string, bool)"/>.</summary>
    public static string ScratchFolder()
    {
        var dir = Path.Combine(Path.GetTempPath(), "serimetry-codecs-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        return dir;
    }
}
