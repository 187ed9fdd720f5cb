using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// A peer broke the DICOM upper layer protocol (PS3.8): malformed, unexpected or oversized PDU. Carries the
/// A-ABORT reason (PS3.8 table 9-26) the association is ended with.
/// </summary>
public sealed class DicomProtocolException(string message, byte abortReason, string? where = null)
    : InputException(message, where, "the sending application must follow PS3.8 (check its DICOM network settings)", null)
{
    /// <summary>The provider A-ABORT reason (see <see cref="AbortReason"/>).</summary>
    public byte AbortReason { get; } = abortReason;

    public override string Kind => "format";
}
