namespace Serimetry.Api.Tests;

/// <summary>Bad store settings stop <c>serimetry serve</c> at start with one clear line and the input exit code, never a password.</summary>
public sealed class StoreOptionsTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    [Fact]
    public void Unknown_store_missing_or_unreachable_connection_are_refused_clearly()
    {
        // Exit code 3 is the CLI's code for input errors (DEVELOPERS.md, Conventions).
        var unknown = ServiceProcess.RunCli("serve", "--data", _data, "--store", "oracle");
        Assert.Equal(3, unknown.ExitCode);
        Assert.Contains("unknown store 'oracle'", unknown.Stderr);

        var missing = ServiceProcess.RunCli("serve", "--data", _data, "--store", "postgres");
        Assert.Equal(3, missing.ExitCode);
        Assert.Contains("needs a connection string", missing.Stderr);

        // Port 1 on loopback: nothing listens there (a privileged port no test starts), so the connection is refused.
        const string password = "pw-7f3c-not-for-logs";
        var unreachable = ServiceProcess.RunCli("keys", "create", "--name", "x", "--data", _data, "--store", "postgres",
            "--connection", $"Host=127.0.0.1;Port=1;Username=serimetry;Password={password};Database=none;Timeout=5");
        Assert.Equal(3, unreachable.ExitCode);
        Assert.Contains("cannot open the postgres metadata store at postgres://127.0.0.1:1/none", unreachable.Stderr);
        Assert.DoesNotContain(password, unreachable.Stdout + unreachable.Stderr);
        Assert.Empty(Directory.GetFiles(_data, "*.db"));
    }
}
