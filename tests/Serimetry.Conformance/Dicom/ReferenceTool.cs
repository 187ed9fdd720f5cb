using System.ComponentModel;
using System.Diagnostics;

namespace Serimetry.Conformance.Dicom;

/// <summary>Runs an outside reference tool (dcmtk, GDCM) and fails clearly when it is missing or fails.</summary>
internal static class ReferenceTool
{
    public static void Run(string tool, params string[] args) => Capture(tool, args);

    /// <summary>Runs the tool and returns its standard output.</summary>
    public static string Capture(string tool, params string[] args)
    {
        var psi = new ProcessStartInfo(tool) { RedirectStandardError = true, RedirectStandardOutput = true };
        foreach (var a in args) psi.ArgumentList.Add(a);
        Process p;
        try
        {
            p = Process.Start(psi) ?? throw new InvalidOperationException($"{tool} did not start");
        }
        catch (Win32Exception ex)
        {
            throw new InvalidOperationException(
                $"{tool} is not installed ({ex.Message}); scripts/test.sh installs dcmtk and libgdcm-tools", ex);
        }
        using (p)
        {
            var stderr = p.StandardError.ReadToEndAsync();
            var stdout = p.StandardOutput.ReadToEndAsync();
            if (!p.WaitForExit(120_000))
            {
                p.Kill(true);
                throw new TimeoutException($"{tool} did not finish within 120 s");
            }
            if (p.ExitCode != 0)
                throw new InvalidOperationException($"{tool} {string.Join(' ', args.Take(8))} failed ({p.ExitCode}): {stderr.Result}{stdout.Result}");
            return stdout.Result;
        }
    }

    /// <summary>A fresh temporary folder, deleted by <see cref="IDisposable.Dispose"/>.</summary>
    public sealed class TempDir : IDisposable
    {
        public string Path { get; } = Directory.CreateTempSubdirectory("serimetry-dicom-").FullName;

        public string File(string name) => System.IO.Path.Combine(Path, name);

        public void Dispose() => Directory.Delete(Path, true);
    }
}
