using System.Globalization;
using System.Net;
using System.Net.Http.Headers;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>One instance the server refused (PS3.18 10.5.3, Failed SOP Sequence (0008,1198)).</summary>
/// <param name="SopInstanceUid">Referenced SOP Instance UID (0008,1155).</param>
/// <param name="FailureReason">Failure Reason (0008,1197), a PS3.7 status code (e.g. 0xA700 out of resources, 0xC000 cannot understand); null when not given.</param>
public sealed record StowFailure(string? SopInstanceUid, int? FailureReason);

/// <summary>The outcome of a STOW-RS store.</summary>
/// <param name="Stored">Instances the server listed in Referenced SOP Sequence (0008,1199).</param>
/// <param name="Failed">Instances it refused.</param>
public sealed record StowResult(int Stored, IReadOnlyList<StowFailure> Failed);

public sealed partial class DicomWebClient
{
    /// <summary>Instances per STOW-RS request: bounds each request's size and duration.</summary>
    public const int StoreBatchSize = 32;

    /// <summary>
    /// STOW-RS Store Instances (PS3.18 10.5, <c>POST {root}/studies</c>) of Part 10 files as
    /// <c>multipart/related; type="application/dicom"</c>, streamed from disk in batches of <see cref="StoreBatchSize"/>.
    /// Every file is read as DICOM first, so a wrong file stops the upload before anything is sent. Refused
    /// instances raise a <see cref="DicomWebException"/> naming the failure reasons.
    /// </summary>
    public async Task<StowResult> StoreAsync(IReadOnlyList<string> files, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(files);
        foreach (var f in files) DicomFile.ReadHeader(f); // InputFormatException names the file that is not DICOM
        int stored = 0;
        var failed = new List<StowFailure>();
        for (int i = 0; i < files.Count; i += StoreBatchSize)
        {
            var batch = await StoreBatchAsync(files.Skip(i).Take(StoreBatchSize).ToList(), ct);
            stored += batch.Stored;
            failed.AddRange(batch.Failed);
        }
        if (failed.Count > 0)
        {
            var reasons = string.Join(", ", failed.GroupBy(f => f.FailureReason)
                .Select(g => $"{g.Count()} x {(g.Key is { } r ? "0x" + r.ToString("X4", CultureInfo.InvariantCulture) : "no reason given")}"));
            throw new DicomWebException($"the server stored {stored} of {files.Count} instances and refused {failed.Count} ({reasons})",
                Where("studies"), "failure reasons are PS3.7 status codes (0xA7xx out of resources, 0xA9xx data set does not match SOP class, 0xC000 cannot understand); check the server's log");
        }
        return new StowResult(stored, failed);
    }

    private async Task<StowResult> StoreBatchAsync(IReadOnlyList<string> files, CancellationToken ct)
    {
        var where = Where("studies");
        using var content = new MultipartContent("related", "serimetry-" + Guid.NewGuid().ToString("N"));
        content.Headers.ContentType!.Parameters.Add(new NameValueHeaderValue("type", "\"application/dicom\""));
        foreach (var f in files)
        {
            var part = new StreamContent(new FileStream(f, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16, useAsync: true));
            part.Headers.ContentType = new MediaTypeHeaderValue("application/dicom");
            content.Add(part);
        }
        using var request = new HttpRequestMessage(HttpMethod.Post, Options.Resolve("studies")) { Content = content };
        request.Headers.Accept.ParseAdd(DicomJson);
        // 409 Conflict: every instance failed; its body still says why (PS3.18 10.5.3.1).
        using var response = await SendAsync(request, HttpCompletionOption.ResponseContentRead, where, ct, HttpStatusCode.Conflict);
        var body = await ReadBoundedAsync(response, where, ct);
        if (body.Length == 0)
            return response.StatusCode == HttpStatusCode.OK ? new StowResult(files.Count, []) : new StowResult(0, [.. files.Select(_ => new StowFailure(null, null))]);
        var answer = DicomJsonDataset.ParseOne(body, where);
        var failed = answer.GetSequence(DicomTags.FailedSOPSequence, where)
            .Select(d => new StowFailure(d.GetString(DicomTags.ReferencedSOPInstanceUID), (int?)d.GetInteger(DicomTags.FailureReason)))
            .ToList();
        int stored = answer.GetSequence(DicomTags.ReferencedSOPSequence, where).Count;
        return new StowResult(stored, failed);
    }
}
