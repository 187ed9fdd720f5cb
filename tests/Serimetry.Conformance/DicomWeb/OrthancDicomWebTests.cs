using System.Text.Json.Nodes;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.DicomWeb;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.DicomWeb;

/// <summary>
/// Our DICOMweb client and the fetch / push / compare verbs against a real DICOMweb server: Orthanc with its
/// DICOMweb plugin (Debian packages orthanc, orthanc-dicomweb), the reference server of these tests. Truth: the
/// phantom exams as written locally (every instance and its pixels come back), the comparison of the local folders
/// (same change.json values), and the server's own QIDO-RS listing after STOW-RS.
/// </summary>
public sealed class OrthancDicomWebTests(DicomWebPhantomFixture fx, ITestOutputHelper output) : IClassFixture<DicomWebPhantomFixture>
{
    private DicomWebClient Client(string? auth = "") =>
        new(DicomWebOptions.Create(fx.Server.DicomWebRoot, auth == "" ? fx.Server.Authorization : auth));

    private static string StudyUid(string examDir) =>
        DicomFile.ReadHeader(Directory.EnumerateFiles(examDir, "*.dcm", SearchOption.AllDirectories).First()).Dataset.GetString(DicomTags.StudyInstanceUID).Trim();

    private static Dictionary<string, byte[]> PixelsBySop(string dir) =>
        Directory.EnumerateFiles(dir, "*.dcm", SearchOption.AllDirectories).Select(f => DicomFile.Read(f)).ToDictionary(
            d => d.Dataset.GetString(DicomTags.SOPInstanceUID).Trim(), d => d.GetPixelData().GetFrameBytes(0));

    [Fact]
    public async Task Upload_pull_compare_and_store_results_back()
    {
        string[] auth = ["--server", fx.Server.DicomWebRoot, "--auth", fx.Server.Authorization];
        int localFiles = Directory.GetFiles(fx.Exam(0), "*.dcm", SearchOption.AllDirectories).Length
                         + Directory.GetFiles(fx.Exam(1), "*.dcm", SearchOption.AllDirectories).Length;

        // STOW-RS with our client, through the push verb.
        var push = ServiceProcess.RunCli(["push", .. auth, fx.Exam(0), fx.Exam(1)]);
        Assert.True(push.ExitCode == 0, push.Stderr);
        Assert.Contains($"stored {localFiles} of {localFiles}", push.Stdout);

        // QIDO-RS: the server lists both studies of the patient (Src: Orthanc's index of what it stored).
        using var client = Client();
        var studies = await client.SearchStudiesAsync(patientId: fx.Subject.SubjectId);
        string[] uids = [StudyUid(fx.Exam(0)), StudyUid(fx.Exam(1))];
        Assert.Equal(uids.Order(), studies.Select(s => s.GetString(DicomTags.StudyInstanceUID)!).Order());

        // WADO-RS through the fetch verb: every instance comes back with identical pixel bytes.
        var fetched = Path.Combine(fx.Dir, "fetched-0");
        var fetch = ServiceProcess.RunCli(["fetch", .. auth, "--study", uids[0], "--out", fetched]);
        Assert.True(fetch.ExitCode == 0, fetch.Stderr);
        var local = PixelsBySop(fx.Exam(0));
        var remote = PixelsBySop(fetched);
        Assert.Equal(local.Keys.Order(), remote.Keys.Order());
        foreach (var (sop, pixels) in local) Assert.Equal(pixels, remote[sop]);
        Assert.Empty(Directory.GetDirectories(fetched, ".fetching-*"));

        // compare on dicomweb: exams equals compare on the local folders (Src: the engine run on the files that were uploaded).
        string[] masks = ["--gland", fx.BaselineMask("gland"), "--lesion", fx.BaselineMask("lesion"), "--no-radiomics"];
        var outLocal = Path.Combine(fx.Dir, "out-local");
        var outRemote = Path.Combine(fx.Dir, "out-remote");
        var before = TempDicomWebFolders();
        var l = ServiceProcess.RunCli(["compare", "--baseline", fx.Exam(0), "--followup", fx.Exam(1), "--out", outLocal, .. masks]);
        Assert.True(l.ExitCode == 0, l.Stderr);
        var r = ServiceProcess.RunCli(["compare", "--baseline", "dicomweb:" + uids[0], "--followup", "dicomweb:" + uids[1], .. auth, "--out", outRemote, .. masks]);
        Assert.True(r.ExitCode == 0, r.Stderr);
        Assert.Equal(before, TempDicomWebFolders()); // the fetched copies were removed
        var jl = JsonNode.Parse(File.ReadAllText(Path.Combine(outLocal, "change.json")))!;
        var jr = JsonNode.Parse(File.ReadAllText(Path.Combine(outRemote, "change.json")))!;
        foreach (var key in new[] { "changes", "trends", "comparability" })
            Assert.Equal(jl[key]!.ToJsonString(), jr[key]!.ToJsonString());
        for (int v = 0; v < 2; v++)
        {
            Assert.Equal(jl["visits"]![v]!["values"]!.ToJsonString(), jr["visits"]![v]!["values"]!.ToJsonString());
            Assert.Equal(jl["visits"]![v]!["registration"]!.ToJsonString(), jr["visits"]![v]!["registration"]!.ToJsonString());
        }
        Assert.NotEmpty(jr["changes"]!.AsArray());

        // STOW-RS the SR and SEGs back; QIDO-RS then lists them in their studies (Src: Orthanc's series index).
        var results = Directory.GetFiles(outRemote, "*.dcm").Order(StringComparer.Ordinal).ToList();
        Assert.Contains(results, f => Path.GetFileName(f) == "sr.dcm");
        Assert.Contains(results, f => Path.GetFileName(f).StartsWith("seg-", StringComparison.Ordinal));
        var stored = await client.StoreAsync(results);
        Assert.Equal(results.Count, stored.Stored);
        foreach (var f in results)
        {
            var ds = DicomFile.ReadHeader(f).Dataset;
            var study = ds.GetString(DicomTags.StudyInstanceUID).Trim();
            var series = await client.SearchSeriesAsync(study);
            var match = Assert.Single(series, s => s.GetString(DicomTags.SeriesInstanceUID) == ds.GetString(DicomTags.SeriesInstanceUID).Trim());
            Assert.Equal(ds.GetString(DicomTags.Modality).Trim(), match.GetString(DicomTags.Modality));
            output.WriteLine($"{Path.GetFileName(f)}: {match.GetString(DicomTags.Modality)} series listed in its study");
        }
        var modalities = new HashSet<string?>();
        foreach (var u in uids) modalities.UnionWith((await client.SearchSeriesAsync(u)).Select(s => s.GetString(DicomTags.Modality)));
        Assert.Contains("SR", modalities);
        Assert.Contains("SEG", modalities);
    }

    [Fact]
    public async Task Unknown_study_is_a_clear_error()
    {
        using var client = Client();
        using var dir = new Tests.Shared.ScratchFolder("serimetry-dw-");
        var e = await Assert.ThrowsAsync<DicomWebException>(() => DicomWebStudyFetcher.FetchAsync(client, "2.25.1234567", Path.Combine(dir.Dir, "x")));
        Assert.Contains("not on the server", e.Message);
        Assert.False(Directory.Exists(Path.Combine(dir.Dir, "x"))); // nothing written
        // WADO-RS of an unknown study: the server's own 404 is passed on with its status (PS3.18 10.4.3).
        var w = await Assert.ThrowsAsync<DicomWebException>(() => client.RetrieveAsync("2.25.1234567", null, dir.Dir));
        Assert.Equal(404, w.StatusCode);
        var cli = ServiceProcess.RunCli("fetch", "--server", fx.Server.DicomWebRoot, "--auth", fx.Server.Authorization, "--study", "2.25.1234567", "--out", Path.Combine(dir.Dir, "y"));
        Assert.Equal(3, cli.ExitCode);
        Assert.Contains("2.25.1234567 is not on the server", cli.Stderr);
    }

    [Fact]
    public async Task Wrong_credentials_are_a_clear_error()
    {
        using var client = Client("Basic " + Convert.ToBase64String("serimetry-test:wrong"u8.ToArray()));
        var e = await Assert.ThrowsAsync<DicomWebException>(() => client.SearchStudiesAsync());
        Assert.Equal(401, e.StatusCode); // Src: RFC 9110 15.5.2 - Orthanc refuses unknown users with 401
        Assert.Contains("--auth", e.Fix);
    }

    [Fact]
    public async Task Server_down_is_a_clear_error()
    {
        int port = OrthancServer.FreePort(); // nothing listens there
        using var client = new DicomWebClient(DicomWebOptions.Create($"http://127.0.0.1:{port}/dicom-web"));
        var e = await Assert.ThrowsAsync<DicomWebException>(() => client.SearchStudiesAsync(studyInstanceUid: "2.25.1"));
        Assert.Null(e.StatusCode);
        Assert.Contains("could not reach", e.Message);
        var cli = ServiceProcess.RunCli("compare", "--baseline", "dicomweb:2.25.1", "--followup", "dicomweb:2.25.2", "--server", $"http://127.0.0.1:{port}/dicom-web",
            "--out", Path.Combine(fx.Dir, "never"));
        Assert.Equal(3, cli.ExitCode);
        Assert.Contains("could not reach the DICOMweb server", cli.Stderr);
        Assert.False(Directory.Exists(Path.Combine(fx.Dir, "never")));
    }

    private static string[] TempDicomWebFolders() =>
        Directory.GetDirectories(Path.GetTempPath(), "serimetry-dicomweb-*").Where(d => !d.Contains("-test-", StringComparison.Ordinal)).Order().ToArray();
}
