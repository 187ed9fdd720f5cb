using Serimetry.Cli;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Cli;

/// <summary>fetch, push and compare's dicomweb: exams refuse bad arguments before any network traffic (exit codes of README: 2 usage, 3 input).</summary>
public sealed class DicomWebVerbTests
{
    private static (int Code, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        return (CliHost.Run(args, o, e), e.ToString());
    }

    // Port 9 (discard) on loopback: nothing is contacted in these tests, every check comes first.
    private const string Server = "http://127.0.0.1:9/dicom-web";

    [Fact]
    public void Compare_with_a_dicomweb_exam_needs_a_server()
    {
        var (code, err) = Run("compare", "--baseline", "dicomweb:1.2.3", "--followup", "dicomweb:1.2.4", "--out", "unused");
        Assert.Equal(CliHost.ExitUsage, code);
        Assert.Contains("--server", err);
    }

    [Fact]
    public void A_study_uid_that_is_not_a_uid_is_refused()
    {
        var (code, err) = Run("fetch", "--server", Server, "--study", "1.2/../admin", "--out", "unused");
        Assert.Equal(CliHost.ExitInput, code);
        Assert.Contains("not a DICOM UID", err);
    }

    [Fact]
    public void Fetch_into_a_folder_that_is_not_empty_is_refused()
    {
        using var dir = new ScratchFolder("serimetry-dwverb-");
        File.WriteAllText(dir.PathOf("keep.txt"), "x");
        var (code, err) = Run("fetch", "--server", Server, "--study", "1.2.3", "--out", dir.Dir);
        Assert.Equal(CliHost.ExitInput, code);
        Assert.Contains("not empty", err);
        Assert.True(File.Exists(dir.PathOf("keep.txt")));
    }

    [Theory]
    [InlineData("ftp://pacs/dicom-web", "Bearer x")]
    [InlineData(Server, "no-credentials-here ,")]
    public void Bad_server_or_auth_is_refused(string server, string auth)
    {
        var (code, err) = Run("push", "--server", server, "--auth", auth, "missing.dcm");
        Assert.Equal(CliHost.ExitInput, code);
        Assert.Contains(server == Server ? "--auth:" : "--server:", err); // the option is named, checked before the files
    }

    [Fact]
    public void Push_of_a_missing_file_is_refused()
    {
        var (code, err) = Run("push", "--server", Server, "no-such-file.dcm");
        Assert.Equal(CliHost.ExitInput, code);
        Assert.Contains("no such file", err);
    }

    [Fact]
    public void Auth_from_a_missing_file_is_refused()
    {
        var (code, err) = Run("fetch", "--server", Server, "--auth", "@no-such-token-file", "--study", "1.2.3", "--out", "unused");
        Assert.Equal(CliHost.ExitInput, code);
        Assert.Contains("Authorization", err);
    }
}
