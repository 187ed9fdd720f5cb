using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// A DICOMweb exchange failed: the server could not be reached, timed out, answered with an error status
/// (<see cref="StatusCode"/>, with the server's own message in <see cref="ServerMessage"/>), or found nothing.
/// Part of the <see cref="InputException"/> family, so hosts report it as one clear line.
/// </summary>
public sealed class DicomWebException(string message, string? where = null, string? fix = null, int? statusCode = null,
    string? serverMessage = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    /// <summary>The HTTP status the server answered with; null when no answer came (unreachable, timeout).</summary>
    public int? StatusCode { get; } = statusCode;

    /// <summary>The server's explanation (its response body, shortened to one line), when it sent one.</summary>
    public string? ServerMessage { get; } = serverMessage;

    public override string Kind => "dicomweb";
}
