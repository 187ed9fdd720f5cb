using System.Net;
using System.Text.Json.Nodes;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Api.Jobs;
using Serimetry.Engine.Io.DicomWeb;
using Serimetry.Tests.Shared;

namespace Serimetry.Api.Tests;

/// <summary>
/// The comparison option <c>storeResults</c>: when the job finishes, the service stores sr.dcm and seg-&lt;visit&gt;.dcm on
/// its configured DICOMweb server (STOW-RS). Reference server: Orthanc with its DICOMweb plugin (Debian packages
/// orthanc, orthanc-dicomweb); truth: Orthanc's own QIDO-RS listing of the stored series.
/// </summary>
public sealed class DicomWebStoreTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    [Fact]
    public async Task Finished_comparison_stores_its_SR_and_SEG_on_the_DICOMweb_server()
    {
        using var orthanc = new OrthancServer();
        string key = ServiceProcess.CreateKey(_data, "dicomweb");
        using var service = await ServiceProcess.Start(_data, "--dicomweb-server", orthanc.DicomWebRoot, "--dicomweb-auth", orthanc.Authorization);
        using var api = new ApiClient(service.BaseUrl, key);

        string id = await Workflow.SubmitPhantomComparison(api, options: new JsonObject { ["storeResults"] = true, ["radiomics"] = false });
        var done = await api.WaitFinished(id);
        Assert.Equal("done", (string?)done["state"]);
        var dcm = done["files"]!.AsArray().Select(f => (string)f!).Where(f => f.EndsWith(".dcm", StringComparison.Ordinal)).ToList();
        Assert.Contains("sr.dcm", dcm);

        JsonNode? outcome = null;
        for (int i = 0; i < 1200 && outcome is null; i++) // bounded wait for the follow-up job (not a speed assertion)
        {
            using var r = await api.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/{ResultStoreJob.OutcomeFile}");
            if (r.StatusCode == HttpStatusCode.OK) outcome = JsonNode.Parse(await r.Content.ReadAsStringAsync());
            else await Task.Delay(100);
        }
        Assert.NotNull(outcome);
        Assert.True((string?)outcome!["state"] == "stored", outcome.ToJsonString());
        Assert.Equal(dcm.Count, (int)outcome["stored"]!);

        // Src: Orthanc's QIDO-RS lists each stored object as a series of its study, with its modality.
        using var client = new DicomWebClient(DicomWebOptions.Create(orthanc.DicomWebRoot, orthanc.Authorization));
        foreach (var name in dcm)
        {
            using var r = await api.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/{name}");
            var ds = DicomFile.Read(await r.Content.ReadAsByteArrayAsync()).Dataset;
            var series = await client.SearchSeriesAsync(ds.GetString(DicomTags.StudyInstanceUID).Trim());
            var match = Assert.Single(series, s => s.GetString(DicomTags.SeriesInstanceUID) == ds.GetString(DicomTags.SeriesInstanceUID).Trim());
            Assert.Equal(name == "sr.dcm" ? "SR" : "SEG", match.GetString(DicomTags.Modality));
        }
        Assert.DoesNotContain(orthanc.Password, service.Log); // the credentials never reach the log
    }

    [Fact]
    public async Task StoreResults_without_a_configured_server_is_refused()
    {
        string key = ServiceProcess.CreateKey(_data, "dicomweb");
        using var service = await ServiceProcess.Start(_data);
        using var api = new ApiClient(service.BaseUrl, key);
        var body = new JsonObject { ["baselineStudyId"] = "a", ["followupStudyIds"] = new JsonArray("b"), ["options"] = new JsonObject { ["storeResults"] = true } };
        using var r = await api.Send(HttpMethod.Post, "/v1/comparisons", ApiClient.Json(body));
        Assert.Equal(HttpStatusCode.BadRequest, r.StatusCode);
        Assert.Contains("dicomweb-server", await r.Content.ReadAsStringAsync());
    }
}
