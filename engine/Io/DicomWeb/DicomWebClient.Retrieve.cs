using System.Net;
using System.Net.Http.Headers;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>What one WADO-RS retrieve wrote.</summary>
/// <param name="Files">One file per instance, in the order the server sent them.</param>
/// <param name="RequestedTransferSyntax">The transfer-syntax the server accepted: Explicit VR Little Endian, or "*" after a 406.</param>
public sealed record WadoRetrieveResult(IReadOnlyList<string> Files, string RequestedTransferSyntax);

public sealed partial class DicomWebClient
{
    /// <summary>Any transfer syntax the server holds (PS3.18 8.7.3.5.2).</summary>
    public const string AnyTransferSyntax = "*";

    /// <summary>
    /// WADO-RS Retrieve Study or Series (PS3.18 10.4.1.1.1/2, <c>GET {root}/studies/{uid}[/series/{uid}]</c>) as
    /// <c>multipart/related; type="application/dicom"</c>, asking first for Explicit VR Little Endian (uncompressed);
    /// when the server answers 406 Not Acceptable, asking again for any transfer syntax ("*"), whose compressed
    /// pixels the engine's codecs decode when the exam is read. Each part is streamed to
    /// <c>{directory}/{n:D6}.dcm</c>; nothing is held in memory beyond one read buffer.
    /// </summary>
    public async Task<WadoRetrieveResult> RetrieveAsync(string studyInstanceUid, string? seriesInstanceUid, string directory,
        CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(directory);
        string path = "studies/" + DicomWebOptions.CheckUid(studyInstanceUid, "Study Instance UID")
            + (seriesInstanceUid is null ? "" : "/series/" + DicomWebOptions.CheckUid(seriesInstanceUid, "Series Instance UID"));
        var where = Where(path);
        Directory.CreateDirectory(directory);
        foreach (var ts in (string[])[DicomTransferSyntax.ExplicitVRLittleEndian, AnyTransferSyntax])
        {
            using var request = new HttpRequestMessage(HttpMethod.Get, Options.Resolve(path));
            request.Headers.Accept.Add(MediaTypeWithQualityHeaderValue.Parse($"multipart/related; type=\"application/dicom\"; transfer-syntax={ts}"));
            using var response = await SendAsync(request, HttpCompletionOption.ResponseHeadersRead, where, ct,
                ts == AnyTransferSyntax ? [] : [HttpStatusCode.NotAcceptable]);
            if (response.StatusCode == HttpStatusCode.NotAcceptable) continue;
            var files = await ReadPartsAsync(response, directory, where, ct);
            return new WadoRetrieveResult(files, ts);
        }
        throw new InvalidOperationException("unreachable: the '*' request either succeeds or throws");
    }

    private async Task<List<string>> ReadPartsAsync(HttpResponseMessage response, string directory, string where, CancellationToken ct)
    {
        var contentType = MimeContentType.Parse(response.Content.Headers.ContentType?.ToString() ?? "", where);
        if (contentType.MediaType != "multipart/related" || contentType["boundary"] is not { } boundary)
            throw new InputFormatException($"the retrieve answer is '{contentType.MediaType}', not multipart/related with a boundary", where,
                "the URL may not be a DICOMweb root; check --server");
        var files = new List<string>();
        FileStream? current = null;
        try
        {
            await using var body = await response.Content.ReadAsStreamAsync(ct);
            var reader = new MultipartRelatedReader(body, boundary, Options.Limits, where, Options.Timeout);
            while (true)
            {
                string file = Path.Combine(directory, $"{files.Count + 1:D6}.dcm");
                var part = await reader.ReadNextAsync(h =>
                {
                    RequireDicomPart(h, files.Count + 1, where);
                    return current = new FileStream(file, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16, useAsync: true);
                }, ct);
                if (current is not null)
                {
                    await current.DisposeAsync();
                    current = null;
                }
                if (part is null) return files;
                files.Add(file);
            }
        }
        catch (Exception e) when (e is HttpRequestException or HttpIOException)
        {
            throw new DicomWebException($"the transfer was cut off after {files.Count} instances ({e.Message})", where,
                "the connection to the server broke; try again", inner: e);
        }
        finally
        {
            current?.Dispose();
        }
    }

    private static void RequireDicomPart(MultipartPartHeaders h, int index, string where)
    {
        var type = h.ContentType is { } t ? MimeContentType.Parse(t, where).MediaType : "application/dicom"; // RFC 2387 3.1: the 'type' parameter is the default
        if (type != "application/dicom")
            throw new InputFormatException($"part {index} of the retrieve answer is '{type}', not application/dicom", where,
                "the server sent something other than DICOM instances; check the server");
    }
}
