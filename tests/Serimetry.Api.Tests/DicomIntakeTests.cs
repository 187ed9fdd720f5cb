using System.Diagnostics;
using System.IO.Compression;
using System.Net;
using System.Net.Http.Headers;
using Serimetry.Tests.Shared;

namespace Serimetry.Api.Tests;

/// <summary>DICOM study intake as a zip and as DICOMweb STOW-RS style multipart/related (PS3.18 §10.5), against dcmtk.</summary>
public sealed class DicomIntakeTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    private static string[] Files() =>
        Directory.GetFiles(SharedReference.PathOf("dicom", "series-oblique"), "*.dcm").Order(StringComparer.Ordinal).ToArray();

    private static string DcmdumpValue(string file, string tag)
    {
        var psi = new ProcessStartInfo("dcmdump", ["+P", tag, file]) { RedirectStandardOutput = true };
        using var p = Process.Start(psi)!;
        string line = p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        int a = line.IndexOf('['), b = line.IndexOf(']');
        return a >= 0 && b > a ? line[(a + 1)..b] : "";
    }

    [Fact]
    public async Task Dicom_zip_and_multipart_related_uploads_are_indexed_like_dcmtk_reads_them()
    {
        string data = _data;
        string key = ServiceProcess.CreateKey(data, "dicom");
        using var service = await ServiceProcess.Start(data);
        using var api = new ApiClient(service.BaseUrl, key);
        var files = Files();

        using var zipStream = new MemoryStream();
        using (var z = new ZipArchive(zipStream, ZipArchiveMode.Create, leaveOpen: true))
            foreach (var f in files) z.CreateEntryFromFile(f, Path.GetFileName(f));
        var fromZip = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(zipStream.ToArray(), "application/zip"));

        var multipart = new MultipartContent("related", "serimetry-boundary-1");
        multipart.Headers.ContentType!.Parameters.Add(new NameValueHeaderValue("type", "\"application/dicom\""));
        foreach (var f in files) multipart.Add(ApiClient.Bytes(File.ReadAllBytes(f), "application/dicom"));
        var fromParts = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", multipart);

        // Src: dcmtk's dcmdump reading Patient ID (0010,0020), Study Date (0008,0020), Rows/Columns of the same files.
        string first = files[0];
        foreach (var study in new[] { fromZip, fromParts })
        {
            Assert.Equal(DcmdumpValue(first, "0010,0020"), (string?)study["patientId"] ?? "");
            Assert.Equal(DcmdumpValue(first, "0008,0020"), ((string?)study["studyDate"] ?? "").Replace("-", ""));
            var series = Assert.Single(study["series"]!.AsArray());
            var size = series!["size"]!.AsArray().Select(n => (int)n!).ToArray();
            Assert.Equal(files.Length, size[2]);
        }
        Assert.Equal(fromZip["series"]!.ToJsonString(), fromParts["series"]!.ToJsonString());
        service.Kill();
        // No PHI in the log: neither Patient ID nor Patient's Name (0010,0010) as dcmdump reads them.
        foreach (var tag in new[] { "0010,0020", "0010,0010" })
        {
            string phi = DcmdumpValue(first, tag);
            Assert.NotEmpty(phi);
            Assert.DoesNotContain(phi, service.Log);
        }
    }
}
