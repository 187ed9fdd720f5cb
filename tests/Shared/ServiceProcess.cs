using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;

namespace Serimetry.Tests.Shared;

/// <summary>
/// A real <c>serimetry serve</c> child process (tests and benchmarks) on a free loopback port with its own data folder; stdout and
/// stderr (the service log) are captured for the PHI checks.
/// </summary>
public sealed class ServiceProcess : IDisposable
{
    private readonly Process _process;
    private readonly StringBuilder _log = new();

    private ServiceProcess(Process p, string url)
    {
        _process = p;
        BaseUrl = url;
    }

    public string BaseUrl { get; }

    public string Log { get { lock (_log) return _log.ToString(); } }

    /// <summary>Path of the built CLI (copied beside the tests by the project reference).</summary>
    public static string CliDll => Path.Combine(AppContext.BaseDirectory, "serimetry.dll");

    public static Task<ServiceProcess> Start(string dataDir, params string[] extra) => Start(dataDir, extra, null);

    /// <summary>Starts a node with extra environment variables (e.g. <c>DOTNET_PROCESSOR_COUNT</c> to model a smaller machine).</summary>
    public static async Task<ServiceProcess> Start(string dataDir, string[] extra, IReadOnlyDictionary<string, string>? environment)
    {
        int port = FreePort();
        string url = $"http://127.0.0.1:{port}";
        var psi = Psi(["serve", "--data", dataDir, "--urls", url, .. extra]);
        foreach (var (k, v) in environment ?? new Dictionary<string, string>()) psi.Environment[k] = v;
        var p = Process.Start(psi)!;
        var s = new ServiceProcess(p, url);
        p.OutputDataReceived += (_, e) => s.Append(e.Data);
        p.ErrorDataReceived += (_, e) => s.Append(e.Data);
        p.BeginOutputReadLine();
        p.BeginErrorReadLine();
        await s.WaitHealthy();
        return s;
    }

    /// <summary>Runs <c>serimetry keys create</c> (with store options in <paramref name="extra"/>) and returns the last line of its output (the key).</summary>
    public static string CreateKey(string dataDir, string name, params string[] extra)
    {
        using var p = Process.Start(Psi(["keys", "create", "--name", name, "--data", dataDir, .. extra]))!;
        var errors = p.StandardError.ReadToEndAsync();
        string output = p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"keys create failed ({p.ExitCode}): {errors.Result}");
        return output.TrimEnd().Split('\n')[^1].Trim();
    }

    /// <summary>Runs the CLI to its end (at most two minutes) and returns its exit code, stdout and stderr.</summary>
    public static (int ExitCode, string Stdout, string Stderr) RunCli(params string[] args) =>
        ToolProcess.Run(Psi(args), TimeSpan.FromMinutes(2));

    private static ProcessStartInfo Psi(string[] args)
    {
        var psi = ToolProcess.StartInfo("dotnet", [CliDll, .. args]);
        psi.Environment["DOTNET_NOLOGO"] = "1";
        return psi;
    }

    private void Append(string? line)
    {
        if (line is null) return;
        lock (_log) _log.AppendLine(line);
    }

    private async Task WaitHealthy()
    {
        using var http = new HttpClient();
        for (int i = 0; i < 600; i++)
        {
            if (_process.HasExited) throw new InvalidOperationException("service exited early:\n" + Log);
            try
            {
                if ((await http.GetAsync(BaseUrl + "/health")).StatusCode == HttpStatusCode.OK) return;
            }
            catch (HttpRequestException) { }
            await Task.Delay(100);
        }
        throw new TimeoutException("service did not become healthy:\n" + Log);
    }

    private static int FreePort()
    {
        using var l = new TcpListener(IPAddress.Loopback, 0);
        l.Start();
        return ((IPEndPoint)l.LocalEndpoint).Port;
    }

    /// <summary>Kills the process at once (SIGKILL: no graceful shutdown, like a node crash).</summary>
    public void Kill()
    {
        if (!_process.HasExited) _process.Kill(entireProcessTree: true);
        _process.WaitForExit();
    }

    public void Dispose()
    {
        Kill();
        _process.Dispose();
    }
}
