using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;

namespace Serimetry.Tests.Shared;

/// <summary>
/// A throwaway PostgreSQL server for tests and benchmarks, from Debian's <c>postgresql</c> binaries: <c>initdb</c>
/// into a temporary folder, <c>postgres</c> on a free loopback port (socket in the same folder), readiness by
/// <c>pg_isready</c>, stopped and deleted on dispose (also when start-up fails). initdb refuses to run as root, so
/// as root every server command runs as the <c>postgres</c> user (<c>runuser</c>) in a folder owned by it.
/// Trust authentication on 127.0.0.1 only: the cluster lives as long as one test run and holds test data only.
/// </summary>
public sealed class PostgresCluster : IDisposable
{
    private const string User = "serimetry";
    private readonly string _bin;
    private readonly string _root;
    private readonly bool _asPostgresUser;
    private readonly StringBuilder _log = new();
    private Process? _server;

    private PostgresCluster(string bin, string root, bool asPostgresUser, int port)
    {
        (_bin, _root, _asPostgresUser, Port) = (bin, root, asPostgresUser, port);
    }

    /// <summary>The server's TCP port on 127.0.0.1.</summary>
    public int Port { get; }

    private string DataDir => Path.Combine(_root, "data");

    /// <summary>What the server printed (for failure messages).</summary>
    public string Log { get { lock (_log) return _log.ToString(); } }

    /// <summary>The folder with initdb, postgres and pg_ctl: the newest /usr/lib/postgresql/N/bin, else the PATH.</summary>
    public static string? FindBinaries()
    {
        const string debian = "/usr/lib/postgresql";
        if (Directory.Exists(debian))
        {
            var newest = Directory.GetDirectories(debian)
                .Select(d => (Dir: Path.Combine(d, "bin"), Version: int.TryParse(Path.GetFileName(d), out var v) ? v : -1))
                .Where(d => File.Exists(Path.Combine(d.Dir, "initdb"))).OrderByDescending(d => d.Version).FirstOrDefault();
            if (newest.Dir is not null) return newest.Dir;
        }
        foreach (var dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':', StringSplitOptions.RemoveEmptyEntries))
            if (File.Exists(Path.Combine(dir, "initdb")) && File.Exists(Path.Combine(dir, "postgres"))) return dir;
        return null;
    }

    /// <summary>Creates and starts a cluster; throws with the server log when it does not come up within a minute.</summary>
    public static PostgresCluster Start()
    {
        string bin = FindBinaries() ?? throw new InvalidOperationException(
            "PostgreSQL server binaries not found (initdb, postgres): install Debian's postgresql package (scripts/test.sh does)");
        bool root = Environment.UserName == "root";
        string dir = Directory.CreateTempSubdirectory("serimetry-pg-").FullName;
        var cluster = new PostgresCluster(bin, dir, root, FreePort());
        try
        {
            if (root) Run("chown", ["postgres:postgres", dir]);
            cluster.RunAsOwner(Path.Combine(bin, "initdb"), ["-D", cluster.DataDir, "-U", User, "-A", "trust", "-E", "UTF8", "--no-locale", "--no-sync"]);
            cluster.Launch();
            cluster.WaitReady();
            return cluster;
        }
        catch
        {
            cluster.Dispose();
            throw;
        }
    }

    /// <summary>Creates database <paramref name="name"/> and returns its Npgsql connection string.</summary>
    public string CreateDatabase(string name)
    {
        Run(Path.Combine(_bin, "createdb"), ["-h", "127.0.0.1", "-p", Port.ToString(), "-U", User, name]);
        return ConnectionString(name);
    }

    /// <summary>Npgsql connection string of database <paramref name="name"/>.</summary>
    public string ConnectionString(string name) => $"Host=127.0.0.1;Port={Port};Username={User};Database={name}";

    /// <summary>Runs one SQL statement with psql and returns its unaligned, tuples-only output.</summary>
    public string Sql(string database, string sql) =>
        Run(Path.Combine(_bin, "psql"), ["-h", "127.0.0.1", "-p", Port.ToString(), "-U", User, "-d", database, "-At", "-v", "ON_ERROR_STOP=1", "-c", sql]);

    private void Launch()
    {
        // fsync off: a crash of the test machine may lose this throwaway cluster, nothing else.
        string[] args = ["-D", DataDir, "-k", _root, "-p", Port.ToString(), "-c", "listen_addresses=127.0.0.1", "-c", "fsync=off",
            "-c", "max_connections=200"];
        var psi = Psi(Path.Combine(_bin, "postgres"), args);
        _server = Process.Start(psi)!;
        _server.OutputDataReceived += (_, e) => Append(e.Data);
        _server.ErrorDataReceived += (_, e) => Append(e.Data);
        _server.BeginOutputReadLine();
        _server.BeginErrorReadLine();
    }

    private void WaitReady()
    {
        string isReady = File.Exists(Path.Combine(_bin, "pg_isready")) ? Path.Combine(_bin, "pg_isready") : "pg_isready";
        for (int i = 0; i < 120; i++)
        {
            if (_server!.HasExited) throw new InvalidOperationException($"postgres exited with {_server.ExitCode}:\n{Log}");
            using var p = Process.Start(Psi(isReady, ["-h", "127.0.0.1", "-p", Port.ToString(), "-t", "1"], asOwner: false))!;
            p.WaitForExit();
            if (p.ExitCode == 0) return;
            Thread.Sleep(250);
        }
        throw new TimeoutException($"postgres did not accept connections within 30 s:\n{Log}");
    }

    private void Append(string? line)
    {
        if (line is null) return;
        lock (_log) _log.AppendLine(line);
    }

    private ProcessStartInfo Psi(string exe, IEnumerable<string> args, bool asOwner = true)
    {
        var psi = new ProcessStartInfo(asOwner && _asPostgresUser ? "runuser" : exe)
        {
            RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false, WorkingDirectory = _root,
        };
        if (asOwner && _asPostgresUser) foreach (var a in new[] { "-u", "postgres", "--", exe }) psi.ArgumentList.Add(a);
        foreach (var a in args) psi.ArgumentList.Add(a);
        return psi;
    }

    private void RunAsOwner(string exe, IEnumerable<string> args)
    {
        using var p = Process.Start(Psi(exe, args))!;
        string output = p.StandardOutput.ReadToEnd() + p.StandardError.ReadToEnd();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"{Path.GetFileName(exe)} failed with {p.ExitCode}:\n{output}");
    }

    private static string Run(string exe, IEnumerable<string> args)
    {
        var (exitCode, output, stderr) = ToolProcess.Run(exe, [.. args]);
        if (exitCode != 0) throw new InvalidOperationException($"{Path.GetFileName(exe)} failed with {exitCode}: {stderr}");
        return output.Trim();
    }

    private static int FreePort()
    {
        using var l = new TcpListener(IPAddress.Loopback, 0);
        l.Start();
        return ((IPEndPoint)l.LocalEndpoint).Port;
    }

    /// <summary>Stops the server (immediate shutdown: the data is thrown away) and deletes the folder.</summary>
    public void Dispose()
    {
        if (_server is { HasExited: false })
        {
            try { RunAsOwner(Path.Combine(_bin, "pg_ctl"), ["-D", DataDir, "-m", "immediate", "-w", "-t", "20", "stop"]); }
            catch (InvalidOperationException) { KillPostmaster(); }
            if (!_server.WaitForExit(10_000)) _server.Kill(entireProcessTree: true);
        }
        _server?.Dispose();
        try { Directory.Delete(_root, recursive: true); }
        catch (IOException) { } // a file still held by an exiting process; the OS temp cleaner removes it later
        catch (UnauthorizedAccessException) { }
    }

    /// <summary>Kills the postmaster by the pid in its lock file (first line of postmaster.pid) when pg_ctl could not stop it.</summary>
    private void KillPostmaster()
    {
        string pidFile = Path.Combine(DataDir, "postmaster.pid");
        if (!File.Exists(pidFile) || !int.TryParse(File.ReadLines(pidFile).FirstOrDefault(), out int pid)) return;
        try { Process.GetProcessById(pid).Kill(entireProcessTree: true); }
        catch (ArgumentException) { } // already gone
    }
}
