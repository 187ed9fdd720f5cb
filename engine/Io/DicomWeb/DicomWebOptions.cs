using System.Net.Http.Headers;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// Where and how to reach a DICOMweb server (PS3.18). <see cref="BaseUrl"/> is the service root under which
/// <c>/studies</c> lives (for Orthanc's DICOMweb plugin: <c>http://host:8042/dicom-web</c>).
/// </summary>
/// <param name="BaseUrl">The DICOMweb root, http or https.</param>
/// <param name="Authorization">The full Authorization header value, e.g. "Bearer TOKEN" or "Basic BASE64"; null for none. Never logged.</param>
/// <param name="Timeout">Longest wait for the server to answer a request, and for the next bytes of a streamed retrieve.</param>
/// <param name="ConnectTimeout">Longest wait to open the connection.</param>
/// <param name="Limits">Size limits on what the server may send.</param>
public sealed record DicomWebOptions(Uri BaseUrl, string? Authorization, TimeSpan Timeout, TimeSpan ConnectTimeout, DicomWebLimits Limits)
{
    /// <summary>Default wait for an answer or the next bytes: 120 s.</summary>
    public static readonly TimeSpan DefaultTimeout = TimeSpan.FromSeconds(120);

    /// <summary>Default wait to connect: 15 s.</summary>
    public static readonly TimeSpan DefaultConnectTimeout = TimeSpan.FromSeconds(15);

    /// <summary>
    /// Validated options: the URL must be absolute http(s) without query, the Authorization value a
    /// well-formed "scheme credentials" header; both errors are <see cref="InvalidParameterException"/>s.
    /// </summary>
    public static DicomWebOptions Create(string baseUrl, string? authorization = null, TimeSpan? timeout = null,
        TimeSpan? connectTimeout = null, DicomWebLimits? limits = null)
    {
        if (!Uri.TryCreate(baseUrl, UriKind.Absolute, out var uri) || uri.Scheme is not ("http" or "https")
            || !string.IsNullOrEmpty(uri.Query) || !string.IsNullOrEmpty(uri.Fragment))
            throw new InvalidParameterException($"'{baseUrl}' is not an http(s) URL without query", "--server",
                "give the DICOMweb root, e.g. http://pacs.example:8042/dicom-web");
        if (authorization is not null
            && (authorization.AsSpan().IndexOfAny('\r', '\n') >= 0 || !AuthenticationHeaderValue.TryParse(authorization, out _)))
            throw new InvalidParameterException("the Authorization value is not 'SCHEME CREDENTIALS'", "--auth",
                "give the whole header value, e.g. 'Bearer TOKEN' or 'Basic BASE64(user:password)'");
        var t = timeout ?? DefaultTimeout;
        if (t <= TimeSpan.Zero) throw new InvalidParameterException($"timeout {t} is not positive", "--timeout", "give a number of seconds above 0");
        return new DicomWebOptions(uri, authorization, t, connectTimeout ?? DefaultConnectTimeout, limits ?? DicomWebLimits.Default);
    }

    /// <summary>The URL of a path under the root ("studies/…"), built from segments that are checked UIDs.</summary>
    internal Uri Resolve(string relative) => new(BaseUrl.AbsoluteUri.TrimEnd('/') + "/" + relative);

    /// <summary>Throws <see cref="InvalidParameterException"/> unless <paramref name="uid"/> is a UID (PS3.5 9.1), so it is safe in a URL path.</summary>
    public static string CheckUid(string uid, string what)
    {
        if (!DicomUids.IsValid(uid))
            throw new InvalidParameterException($"'{uid}' is not a DICOM UID (digits and dots, at most 64 characters, PS3.5 9.1)", what,
                "copy the UID exactly, e.g. from 'serimetry inspect' or the PACS");
        return uid;
    }
}
