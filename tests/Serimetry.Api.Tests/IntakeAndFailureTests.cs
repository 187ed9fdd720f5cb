using System.IO.Compression;
using System.Net;
using System.Text.Json.Nodes;

namespace Serimetry.Api.Tests;

/// <summary>Scratch space after intake (success and failure), and the wording of a failed comparison.</summary>
public sealed class IntakeAndFailureTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    private static byte[] Zip(params (string Name, string Text)[] entries)
    {
        using var ms = new MemoryStream();
        using (var z = new ZipArchive(ms, ZipArchiveMode.Create, leaveOpen: true))
            foreach (var (name, text) in entries)
            {
                using var w = new StreamWriter(z.CreateEntry(name).Open());
                w.Write(text);
            }
        return ms.ToArray();
    }

    [Fact]
    public async Task Uploads_leave_no_scratch_and_a_failed_comparison_speaks_in_request_fields()
    {
        string key = ServiceProcess.CreateKey(_data, "intake");
        using var service = await ServiceProcess.Start(_data);
        using var api = new ApiClient(service.BaseUrl, key);
        string incoming = Path.Combine(_data, "incoming"), studies = Path.Combine(_data, "studies");

        // Refused uploads: a path-traversal entry, and files that are neither DICOM nor a NIfTI exam.
        var traversal = await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, "/v1/studies",
            ApiClient.Bytes(Zip(("../evil.dcm", "x")), "application/zip"));
        Assert.Equal("urn:serimetry:problem:input-format", (string?)traversal["type"]);
        await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, "/v1/studies",
            ApiClient.Bytes(Zip(("notes.txt", "not an image")), "application/zip"));
        Assert.Empty(Directory.GetFileSystemEntries(incoming));
        Assert.Empty(Directory.GetFileSystemEntries(studies));

        // Accepted uploads: the study folders stay, scratch goes.
        var ids = await Workflow.UploadPhantom(api);
        Assert.Equal(2, Directory.GetDirectories(studies).Length);
        Assert.Empty(Directory.GetFileSystemEntries(incoming));

        // Baseline and follow-up swapped: the engine refuses (follow-up dated before the baseline). The problem names the
        // request's fields (Src: the body of POST /v1/comparisons, docs/service.md), not the options of 'serimetry compare'.
        string id = await Workflow.Submit(api, ids with { Baseline = ids.Followup, Followup = ids.Baseline });
        var failed = await api.WaitFinished(id);
        Assert.Equal("failed", (string?)failed["state"]);
        var problem = failed["problem"]!.AsObject();
        Assert.Equal("urn:serimetry:problem:input-format", (string?)problem["type"]);
        Assert.Contains("baselineStudyId", (string?)problem["fix"]);
        Assert.Contains("followupStudyIds", (string?)problem["fix"]);
        Assert.DoesNotContain("--", problem.ToJsonString());
        Assert.Empty(Directory.GetFileSystemEntries(incoming));
    }
}
