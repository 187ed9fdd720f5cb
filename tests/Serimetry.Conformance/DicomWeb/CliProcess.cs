using System.Diagnostics;

namespace Serimetry.Conformance.DicomWeb;

/// <summary>Runs the built serimetry program (copied beside the tests through the project reference) as a process.</summary>
internal static class CliProcess
{
    public static (int ExitCode, string Stdout, string Stderr) Run(params string[] args)
    {
        var start = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "serimetry.dll"));
        foreach (var a in args) start.ArgumentList.Add(a);
        using var process = Process.Start(start)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEnd();
        process.WaitForExit();
        return (process.ExitCode, stdout.Result, stderr);
    }
}
