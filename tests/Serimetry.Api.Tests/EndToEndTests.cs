using System.Net;
using System.Text.Json.Nodes;
using Serimetry.Engine;

namespace Serimetry.Api.Tests;

/// <summary>The whole service over HTTP on loopback, as a separate process, against the engine run directly.</summary>
public sealed class EndToEndTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    [Fact]
    public async Task Phantom_comparison_over_http_equals_the_engine_run_directly_and_logs_no_patient_id()
    {
        string data = _data;
        string key = ServiceProcess.CreateKey(data, "e2e");
        using var service = await ServiceProcess.Start(data);
        using var api = new ApiClient(service.BaseUrl, key);

        var study = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(PhantomStudies.VisitZip(0), "application/zip"));
        // Src: the phantom's exam.json written by PhantomWriter (patient id and first visit date of the spec).
        Assert.Equal(PhantomStudies.PatientId, (string?)study["patientId"]);
        Assert.Equal("2022-03-14", (string?)study["studyDate"]);
        Assert.Contains(study["series"]!.AsArray(), s => (string?)s!["role"] == "t2w");
        var again = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(PhantomStudies.VisitZip(0), "application/zip"));
        Assert.Equal((string?)study["studyId"], (string?)again["studyId"]);

        using var callbacks = new CallbackReceiver(failFirst: 1);
        string id = await Workflow.SubmitPhantomComparison(api, callbacks.Url);
        var done = await api.WaitFinished(id);
        Assert.Equal("done", (string?)done["state"]);
        Assert.Equal(SoftwareInfo.Caution, (string?)done["caution"]);

        using var file = await api.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/change.json");
        Assert.Equal(HttpStatusCode.OK, file.StatusCode);
        var served = JsonNode.Parse(await file.Content.ReadAsStringAsync());
        var reference = JsonNode.Parse(PhantomStudies.ReferenceChangeJson);
        Assert.True(JsonNode.DeepEquals(reference, served), "change.json over HTTP differs from the engine's");
        Assert.True(JsonNode.DeepEquals(reference, done["result"]), "status result differs from the engine's change.json");
        Assert.Equal(HttpStatusCode.OK, (await api.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/measures.csv")).StatusCode);
        Assert.Equal(HttpStatusCode.NotFound, (await api.Send(HttpMethod.Get, $"/v1/comparisons/{id}/files/..%2Fserimetry.db")).StatusCode);

        var timeline = await api.Expect(HttpStatusCode.OK, HttpMethod.Get, $"/v1/patients/{PhantomStudies.PatientId}/timeline");
        Assert.Equal(id, (string?)timeline["comparisons"]![0]!["comparisonId"]);

        // Webhook: the first delivery is refused (503), the retry is accepted; the body carries ids only.
        var delivered = await callbacks.WaitFor(2);
        Assert.All(delivered, b => Assert.Contains(id, b));
        Assert.All(delivered, b => Assert.Contains("\"done\"", b));
        Assert.DoesNotContain(delivered, b => b.Contains(PhantomStudies.PatientId));

        service.Kill();
        // Rule of the project: never log patient identifiers. Src: the phantom's patient id is the PHI value grepped for.
        Assert.Contains(id, service.Log);
        Assert.DoesNotContain(PhantomStudies.PatientId, service.Log);
    }
}
