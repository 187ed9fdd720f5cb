using System.Net;
using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.DicomWeb;

/// <summary>
/// The client's protocol behaviour against scripted answers (PS3.18): the transfer-syntax fallback on 406
/// (8.7.3.5 / 10.4.3), error statuses with the server's message, QIDO's 204 No Content (10.6.3.2), STOW-RS
/// failure reporting (10.5.3, Failed SOP Sequence). The live round trip is in the conformance tests (Orthanc).
/// </summary>
public sealed class DicomWebClientTests
{
    private sealed class Scripted(Func<HttpRequestMessage, HttpResponseMessage> answer) : HttpMessageHandler
    {
        public List<string> Accepts { get; } = [];

        protected override Task<HttpResponseMessage> SendAsync(HttpRequestMessage request, CancellationToken ct)
        {
            Accepts.Add(request.Headers.Accept.ToString());
            return Task.FromResult(answer(request));
        }
    }

    private static DicomWebClient Client(HttpMessageHandler h) =>
        new(DicomWebOptions.Create("http://pacs.test/dicom-web", "Bearer t0ken"), h);

    private static HttpResponseMessage Multipart(string boundary, params byte[][] parts)
    {
        var ms = new MemoryStream();
        foreach (var p in parts)
        {
            ms.Write(Encoding.ASCII.GetBytes($"--{boundary}\r\nContent-Type: application/dicom\r\n\r\n"));
            ms.Write(p);
            ms.Write("\r\n"u8);
        }
        ms.Write(Encoding.ASCII.GetBytes($"--{boundary}--"));
        var content = new ByteArrayContent(ms.ToArray());
        content.Headers.TryAddWithoutValidation("Content-Type", $"multipart/related; type=\"application/dicom\"; boundary=\"{boundary}\"");
        return new HttpResponseMessage(HttpStatusCode.OK) { Content = content };
    }

    [Fact]
    public async Task RetrieveFallsBackToAnyTransferSyntaxOn406()
    {
        using var dir = new ScratchFolder("serimetry-dw-");
        var handler = new Scripted(r => r.Headers.Accept.ToString().Contains("transfer-syntax=*")
            ? Multipart("zz", [1, 2, 3], [4])
            : new HttpResponseMessage(HttpStatusCode.NotAcceptable));
        using var client = Client(handler);
        var result = await client.RetrieveAsync("1.2.3", "1.2.3.4", dir.Dir);
        Assert.Equal(DicomWebClient.AnyTransferSyntax, result.RequestedTransferSyntax);
        Assert.Equal(2, handler.Accepts.Count);
        Assert.Contains("transfer-syntax=1.2.840.10008.1.2.1", handler.Accepts[0]); // Explicit VR Little Endian asked first (PS3.5 A.2)
        Assert.Equal([1, 2, 3], File.ReadAllBytes(result.Files[0]));
        Assert.Equal([4], File.ReadAllBytes(result.Files[1]));
    }

    [Fact]
    public async Task ErrorStatusCarriesCodeAndServerMessage()
    {
        var handler = new Scripted(_ => new HttpResponseMessage(HttpStatusCode.ServiceUnavailable)
            { Content = new StringContent("{\n  \"Message\": \"storage is full\"\n}") });
        using var client = Client(handler);
        var e = await Assert.ThrowsAsync<DicomWebException>(() => client.SearchSeriesAsync("1.2.3"));
        Assert.Equal(503, e.StatusCode);
        Assert.Contains("storage is full", e.ServerMessage);
        Assert.Contains("503", e.Message);
        Assert.DoesNotContain("?", e.Where); // no query string (it may hold a Patient ID)
    }

    [Fact]
    public async Task NoContentIsAnEmptySearchResult()
    {
        using var client = Client(new Scripted(_ => new HttpResponseMessage(HttpStatusCode.NoContent)));
        Assert.Empty(await client.SearchStudiesAsync(patientId: "NSC-0007"));
    }

    [Fact]
    public async Task NonMultipartRetrieveAnswerIsAFormatError()
    {
        using var dir = new ScratchFolder("serimetry-dw-");
        using var client = Client(new Scripted(_ => new HttpResponseMessage(HttpStatusCode.OK) { Content = new StringContent("<html/>", Encoding.UTF8, "text/html") }));
        await Assert.ThrowsAsync<InputFormatException>(() => client.RetrieveAsync("1.2.3", null, dir.Dir));
    }

    [Fact]
    public async Task StowFailuresAreReportedWithTheirReasons()
    {
        using var dir = new ScratchFolder("serimetry-dw-");
        var file = dir.PathOf("x.dcm");
        Serimetry.Engine.Io.Dicom.Writing.DicomPart10Writer.Write(file, new Serimetry.Engine.Io.Dicom.Writing.DicomWriteDataset()
            .Add(Serimetry.Engine.Io.Dicom.DicomTags.SOPClassUID, Serimetry.Engine.Io.Dicom.DicomVR.UI, "1.2.840.10008.5.1.4.1.1.4")
            .Add(Serimetry.Engine.Io.Dicom.DicomTags.SOPInstanceUID, Serimetry.Engine.Io.Dicom.DicomVR.UI, "1.2.3.4.5"));
        var body = """{"00081198": {"vr": "SQ", "Value": [{"00081155": {"vr": "UI", "Value": ["1.2.3.4.5"]}, "00081197": {"vr": "US", "Value": [42752]}}]}}""";
        using var client = Client(new Scripted(_ => new HttpResponseMessage(HttpStatusCode.Conflict) { Content = new StringContent(body) }));
        var e = await Assert.ThrowsAsync<DicomWebException>(() => client.StoreAsync([file]));
        Assert.Contains("0xA700", e.Message); // 42752 = 0xA700, "Refused: Out of Resources" (PS3.7 C.4.2)
        Assert.Contains("stored 0 of 1", e.Message);
    }

    [Fact]
    public async Task StowRefusesANonDicomFileBeforeSending()
    {
        using var dir = new ScratchFolder("serimetry-dw-");
        var file = dir.PathOf("notes.txt");
        File.WriteAllText(file, "not DICOM");
        var handler = new Scripted(_ => new HttpResponseMessage(HttpStatusCode.OK));
        using var client = Client(handler);
        await Assert.ThrowsAnyAsync<InputException>(() => client.StoreAsync([file]));
        Assert.Empty(handler.Accepts);
    }

    [Theory]
    [InlineData("ftp://pacs/dicom-web", null)]
    [InlineData("http://pacs/dicom-web?x=1", null)]
    [InlineData("http://pacs/dicom-web", "Bearer a\r\nX-Evil: 1")]
    public void BadOptionsAreParameterErrors(string url, string? auth) =>
        Assert.Throws<InvalidParameterException>(() => DicomWebOptions.Create(url, auth));

    [Fact]
    public async Task UidsAreCheckedBeforeTheyGoIntoAPath()
    {
        using var client = Client(new Scripted(_ => new HttpResponseMessage(HttpStatusCode.OK)));
        await Assert.ThrowsAsync<InvalidParameterException>(() => client.SearchSeriesAsync("1.2/../../admin"));
    }
}
