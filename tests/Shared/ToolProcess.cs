using System.Diagnostics;

namespace Serimetry.Tests.Shared;

/// <summary>
/// Runs an outside program (a reference tool, a database command, the built CLI) to its end with stdout and stderr
/// captured; a run that outlives its time limit is killed with its children and reported.
/// </summary>
public static class ToolProcess
{
    /// <summary>Start information with both outputs redirected and each argument passed as given.</summary>
    public static ProcessStartInfo StartInfo(string exe, IEnumerable<string> args, string? workingDirectory = null)
    {
        var psi = new ProcessStartInfo(exe) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        if (workingDirectory is not null) psi.WorkingDirectory = workingDirectory;
        foreach (var a in args) psi.ArgumentList.Add(a);
        return psi;
    }

    /// <summary>Runs <paramref name="exe"/> with a ten-minute limit.</summary>
    public static (int ExitCode, string Stdout, string Stderr) Run(string exe, params string[] args) =>
        Run(StartInfo(exe, args), TimeSpan.FromMinutes(10));

    /// <summary>Runs a prepared start (outputs must be redirected); both outputs are read concurrently so neither pipe fills.</summary>
    public static (int ExitCode, string Stdout, string Stderr) Run(ProcessStartInfo psi, TimeSpan limit)
    {
        using var p = Process.Start(psi) ?? throw new InvalidOperationException($"{psi.FileName} did not start");
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(limit))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{Path.GetFileName(psi.FileName)} {psi.ArgumentList.FirstOrDefault()} did not end within {limit.TotalMinutes:0.#} minutes");
        }
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
