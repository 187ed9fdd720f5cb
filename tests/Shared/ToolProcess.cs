using System.ComponentModel;
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

    /// <summary>
    /// Runs a reference tool (at most two minutes) and returns its outputs; a non-zero exit is an error carrying both.
    /// <paramref name="debianPackage"/> names what scripts/test.sh installs when the tool is missing.
    /// </summary>
    public static (string Stdout, string Stderr) Checked(string exe, string debianPackage, params string[] args)
    {
        var (exitCode, stdout, stderr) = Run(StartInfo(exe, args), TimeSpan.FromMinutes(2), debianPackage);
        if (exitCode != 0)
            throw new InvalidOperationException($"{exe} {string.Join(' ', args.Take(8))} failed ({exitCode}): {stderr}{stdout}");
        return (stdout, stderr);
    }

    /// <summary>
    /// Runs a prepared start (outputs must be redirected); both outputs are read concurrently so neither pipe fills.
    /// A missing program is an error naming <paramref name="debianPackage"/>, which scripts/test.sh installs.
    /// </summary>
    public static (int ExitCode, string Stdout, string Stderr) Run(ProcessStartInfo psi, TimeSpan limit, string? debianPackage = null)
    {
        using var p = Start(psi, debianPackage);
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(limit))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{Path.GetFileName(psi.FileName)} {psi.ArgumentList.FirstOrDefault()} did not end within {limit.TotalMinutes:0.#} minutes");
        }
        return (p.ExitCode, stdout.Result, stderr.Result);
    }

    private static Process Start(ProcessStartInfo psi, string? debianPackage)
    {
        try
        {
            return Process.Start(psi) ?? throw new InvalidOperationException($"{psi.FileName} did not start");
        }
        catch (Win32Exception e)
        {
            throw new InvalidOperationException(
                $"{psi.FileName} is not installed ({e.Message}); scripts/test.sh installs {debianPackage ?? "the Debian package that provides it"}", e);
        }
    }
}
