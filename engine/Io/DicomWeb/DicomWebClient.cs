using System.Net;
using System.Net.Http.Headers;
using System.Text;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// A DICOMweb client (PS3.18) on <see cref="HttpClient"/>: QIDO-RS search (section 10.6), WADO-RS retrieve of
/// Part 10 instances as multipart/related (10.4) streamed to disk, and STOW-RS store (10.5). Every failure is a
/// <see cref="DicomWebException"/> (unreachable, timeout, error status with the server's message) or another
/// member of the InputException family (malformed answers, limits). Query strings are never put in messages:
/// they may hold a Patient ID.
/// </summary>
public sealed partial class DicomWebClient : IDisposable
{
    private const string DicomJson = "application/dicom+json";
    private readonly HttpClient _http;

    /// <param name="options">Server and limits.</param>
    /// <param name="handler">The HTTP handler; null for a new <see cref="SocketsHttpHandler"/> (tests pass their own).</param>
    public DicomWebClient(DicomWebOptions options, HttpMessageHandler? handler = null)
    {
        Options = options ?? throw new ArgumentNullException(nameof(options));
        handler ??= new SocketsHttpHandler
        {
            ConnectTimeout = options.ConnectTimeout,
            AutomaticDecompression = DecompressionMethods.All,
            PooledConnectionLifetime = TimeSpan.FromMinutes(5),
        };
        // Timeouts are applied per request (see SendAsync) so a long streamed retrieve is bounded by stalls, not by its length.
        _http = new HttpClient(handler, disposeHandler: true) { Timeout = Timeout.InfiniteTimeSpan };
    }

    /// <summary>The options this client was made with.</summary>
    public DicomWebOptions Options { get; }

    /// <summary>
    /// QIDO-RS Search for Studies (PS3.18 10.6.1.2, <c>GET {root}/studies?…</c>) by Patient ID and/or Study Instance
    /// UID (exact match); returns the study-level data sets (possibly none).
    /// </summary>
    public Task<IReadOnlyList<DicomJsonDataset>> SearchStudiesAsync(string? patientId = null, string? studyInstanceUid = null,
        CancellationToken ct = default)
    {
        var query = new List<string>();
        if (patientId is not null) query.Add("PatientID=" + Uri.EscapeDataString(patientId));
        if (studyInstanceUid is not null) query.Add("StudyInstanceUID=" + DicomWebOptions.CheckUid(studyInstanceUid, "Study Instance UID"));
        query.Add("includefield=00081030"); // Study Description; the required study-level attributes come anyway (PS3.18 table 10.6.3-3)
        return QueryAsync("studies", string.Join('&', query), ct);
    }

    /// <summary>QIDO-RS Search for Series of one study (PS3.18 10.6.1.2, <c>GET {root}/studies/{uid}/series</c>).</summary>
    public Task<IReadOnlyList<DicomJsonDataset>> SearchSeriesAsync(string studyInstanceUid, CancellationToken ct = default) =>
        QueryAsync($"studies/{DicomWebOptions.CheckUid(studyInstanceUid, "Study Instance UID")}/series", "includefield=00201209", ct);

    private async Task<IReadOnlyList<DicomJsonDataset>> QueryAsync(string path, string query, CancellationToken ct)
    {
        var where = Where(path);
        using var request = new HttpRequestMessage(HttpMethod.Get, Options.Resolve(path + "?" + query));
        request.Headers.Accept.ParseAdd(DicomJson);
        using var response = await SendAsync(request, HttpCompletionOption.ResponseContentRead, where, ct);
        if (response.StatusCode == HttpStatusCode.NoContent) return []; // no match (PS3.18 10.6.3.2)
        var body = await ReadBoundedAsync(response, where, ct);
        return body.Length == 0 ? [] : DicomJsonDataset.ParseArray(body, where);
    }

    /// <summary>
    /// Sends a request with the Authorization header and the timeout; maps every failure to a <see cref="DicomWebException"/>.
    /// Returns only successful responses (2xx), or the statuses listed in <paramref name="passThrough"/>.
    /// </summary>
    private async Task<HttpResponseMessage> SendAsync(HttpRequestMessage request, HttpCompletionOption completion, string where,
        CancellationToken ct, params HttpStatusCode[] passThrough)
    {
        if (Options.Authorization is { } auth) request.Headers.Authorization = AuthenticationHeaderValue.Parse(auth);
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(ct);
        timeout.CancelAfter(Options.Timeout);
        HttpResponseMessage response;
        try
        {
            response = await _http.SendAsync(request, completion, timeout.Token);
        }
        catch (HttpRequestException e)
        {
            throw new DicomWebException($"could not reach the DICOMweb server ({Describe(e)})", where,
                "check the --server URL and that the server is running and reachable", inner: e);
        }
        catch (OperationCanceledException e) when (!ct.IsCancellationRequested)
        {
            throw new DicomWebException($"the DICOMweb server did not answer within {Options.Timeout.TotalSeconds:0} s", where,
                "the server is overloaded or unreachable; try again or raise --timeout", inner: e);
        }
        if (response.IsSuccessStatusCode || passThrough.Contains(response.StatusCode)) return response;
        using (response) throw await StatusErrorAsync(response, where, ct);
    }

    private static async Task<DicomWebException> StatusErrorAsync(HttpResponseMessage response, string where, CancellationToken ct)
    {
        int code = (int)response.StatusCode;
        string? message = await ServerMessageAsync(response, ct);
        string fix = code switch
        {
            401 or 403 => "the server refused the credentials; check --auth (e.g. 'Bearer TOKEN' or 'Basic BASE64')",
            404 => "the server does not have it, or the URL is not the DICOMweb root; check the UID and --server",
            413 => "the request is too large for the server; send fewer files at a time",
            >= 500 => "the server failed; try again later or check the server's log",
            _ => "check the request and the server's message",
        };
        var text = $"the DICOMweb server answered {code} {response.ReasonPhrase}" + (message is null ? "" : $": {message}");
        return new DicomWebException(text, where, fix, code, message);
    }

    /// <summary>The server's response body as one short line (at most 300 characters), or null.</summary>
    private static async Task<string?> ServerMessageAsync(HttpResponseMessage response, CancellationToken ct)
    {
        try
        {
            await using var s = await response.Content.ReadAsStreamAsync(ct);
            var buf = new byte[4096];
            int n = await s.ReadAtLeastAsync(buf, buf.Length, throwOnEndOfStream: false, ct);
            var text = string.Join(' ', Encoding.UTF8.GetString(buf, 0, n).Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries));
            return text.Length == 0 ? null : text.Length > 300 ? text[..300] + "…" : text;
        }
        catch (Exception e) when (e is HttpRequestException or IOException)
        {
            return null; // the status line alone still says what happened
        }
    }

    private async Task<byte[]> ReadBoundedAsync(HttpResponseMessage response, string where, CancellationToken ct)
    {
        int max = Options.Limits.MaxJsonBytes;
        if (response.Content.Headers.ContentLength > max) throw JsonTooLarge(where, max);
        await using var s = await response.Content.ReadAsStreamAsync(ct);
        using var ms = new MemoryStream();
        var buf = new byte[81920];
        int n;
        while ((n = await s.ReadAsync(buf, ct)) > 0)
        {
            if (ms.Length + n > max) throw JsonTooLarge(where, max);
            ms.Write(buf, 0, n);
        }
        return ms.ToArray();
    }

    private static Core.InputLimitException JsonTooLarge(string where, int max) =>
        new($"the server's JSON answer exceeds {max:N0} bytes", where, "narrow the search");

    /// <summary>"DICOMweb {root}/{path}" for messages: no query string, no credentials.</summary>
    private string Where(string path) => "DICOMweb " + Options.Resolve(path).GetLeftPart(UriPartial.Path);

    private static string Describe(HttpRequestException e) =>
        e.InnerException is { Message.Length: > 0 } inner && !e.Message.Contains(inner.Message, StringComparison.Ordinal)
            ? $"{e.Message} {inner.Message}" : e.Message;

    public void Dispose() => _http.Dispose();
}
