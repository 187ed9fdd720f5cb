using System.Diagnostics;
using System.Net;
using System.Net.Http.Headers;
using System.Net.Sockets;
using System.Text;
using System.Text.Json.Nodes;

namespace Serimetry.Tests.Shared;

/// <summary>
/// The reference DICOMweb server for the conformance tests: Debian's <c>orthanc</c> with the <c>orthanc-dicomweb</c>
/// plugin (installed by scripts/test.sh), started as a child process on loopback with free HTTP and DICOM ports,
/// storage in a temporary folder and one test user (HTTP Basic). Killed and removed on dispose.
/// </summary>
public sealed class OrthancServer : IDisposable
{
    public const string User = "serimetry-test";

    private static readonly string[] PluginCandidates =
        ["/usr/share/orthanc/plugins/libOrthancDicomWeb.so", "/usr/lib/orthanc/libOrthancDicomWeb.so"];

    private readonly Process _process;
    private readonly StringBuilder _log = new();

    public OrthancServer()
    {
        Dir = Directory.CreateTempSubdirectory("serimetry-orthanc-").FullName;
        Password = Guid.NewGuid().ToString("N");
        HttpPort = FreePort();
        var config = new JsonObject
        {
            ["Name"] = "serimetry-conformance",
            ["StorageDirectory"] = Path.Combine(Dir, "storage"),
            ["IndexDirectory"] = Path.Combine(Dir, "storage"),
            ["HttpPort"] = HttpPort,
            ["DicomPort"] = FreePort(),
            ["RemoteAccessAllowed"] = false, // loopback only
            ["AuthenticationEnabled"] = true,
            ["RegisteredUsers"] = new JsonObject { [User] = Password },
            ["Plugins"] = new JsonArray(FindPlugin()),
            ["DicomWeb"] = new JsonObject { ["Enable"] = true, ["Root"] = "/dicom-web/" },
        };
        var configPath = Path.Combine(Dir, "config.json");
        File.WriteAllText(configPath, config.ToJsonString());
        var start = new ProcessStartInfo(FindExecutable()) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        start.ArgumentList.Add(configPath);
        _process = Process.Start(start) ?? throw new InvalidOperationException("Orthanc did not start");
        _process.OutputDataReceived += (_, e) => Append(e.Data);
        _process.ErrorDataReceived += (_, e) => Append(e.Data);
        _process.BeginOutputReadLine();
        _process.BeginErrorReadLine();
        WaitUntilUp();
    }

    public string Dir { get; }

    public int HttpPort { get; }

    public string Password { get; }

    /// <summary>The DICOMweb root.</summary>
    public string DicomWebRoot => $"http://127.0.0.1:{HttpPort}/dicom-web";

    /// <summary>The Authorization header value of the test user (RFC 7617 Basic).</summary>
    public string Authorization => "Basic " + Convert.ToBase64String(Encoding.UTF8.GetBytes($"{User}:{Password}"));

    public string Log
    {
        get
        {
            lock (_log) return _log.ToString();
        }
    }

    /// <summary>A loopback port that nothing listens on (the OS picks it; closed again at once).</summary>
    public static int FreePort()
    {
        var l = new TcpListener(IPAddress.Loopback, 0);
        l.Start();
        int port = ((IPEndPoint)l.LocalEndpoint).Port;
        l.Stop();
        return port;
    }

    private void WaitUntilUp()
    {
        using var http = new HttpClient();
        http.DefaultRequestHeaders.Authorization = AuthenticationHeaderValue.Parse(Authorization);
        // Bounded wait for start-up (not an assertion on speed): Orthanc opens its database and loads the plugin first.
        for (int i = 0; i < 300; i++)
        {
            if (_process.HasExited)
                throw new InvalidOperationException($"Orthanc exited with {_process.ExitCode} during start-up:\n{Log}");
            try
            {
                if (http.GetAsync($"http://127.0.0.1:{HttpPort}/system").GetAwaiter().GetResult().IsSuccessStatusCode) return;
            }
            catch (HttpRequestException)
            {
                // not listening yet
            }
            Thread.Sleep(200);
        }
        throw new InvalidOperationException($"Orthanc did not answer /system within 60 s:\n{Log}");
    }

    private void Append(string? line)
    {
        if (line is null) return;
        lock (_log) _log.AppendLine(line);
    }

    private static string FindExecutable()
    {
        var dirs = (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':').Append("/usr/sbin").Append("/usr/bin");
        return dirs.Select(d => Path.Combine(d, "Orthanc")).FirstOrDefault(File.Exists)
               ?? throw new InvalidOperationException("Orthanc is not installed (scripts/test.sh installs orthanc and orthanc-dicomweb)");
    }

    private static string FindPlugin()
    {
        foreach (var p in PluginCandidates)
            if (File.Exists(p)) return p;
        var versioned = Directory.Exists("/usr/lib/orthanc") ? Directory.GetFiles("/usr/lib/orthanc", "libOrthancDicomWeb.so*").Order().FirstOrDefault() : null;
        return versioned ?? throw new InvalidOperationException("the Orthanc DICOMweb plugin is not installed (scripts/test.sh installs orthanc-dicomweb)");
    }

    public void Dispose()
    {
        try
        {
            if (!_process.HasExited) _process.Kill(entireProcessTree: true);
            _process.WaitForExit(10_000);
        }
        finally
        {
            _process.Dispose();
            try { Directory.Delete(Dir, recursive: true); }
            catch (IOException) { /* the OS temp cleaner removes it later */ }
        }
    }
}
