namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>PDU types of the DICOM upper layer protocol (PS3.8 section 9.3, table 9-1 … 9-26).</summary>
public enum PduType : byte
{
    AssociateRequest = 0x01,
    AssociateAccept = 0x02,
    AssociateReject = 0x03,
    PData = 0x04,
    ReleaseRequest = 0x05,
    ReleaseResponse = 0x06,
    Abort = 0x07,
}

/// <summary>A protocol data unit of the DICOM upper layer (PS3.8 section 9.3).</summary>
public abstract record Pdu
{
    /// <summary>The PDU-type field.</summary>
    public abstract PduType Type { get; }
}

/// <summary>An item or sub-item kept as it came (type and value), for the ones this side does not interpret.</summary>
public sealed record PduItem(byte ItemType, byte[] Value);

/// <summary>
/// User Information item (PS3.8 9.3.2.3, annex D.3.3): maximum length received (0 = no limit), the peer's
/// implementation class UID and version name, and the other sub-items unparsed (asynchronous operations window,
/// role selection, extended negotiation, user identity).
/// </summary>
public sealed record UserInformation(uint MaxPduLength, string? ImplementationClassUid, string? ImplementationVersionName,
    IReadOnlyList<PduItem> Others)
{
    /// <summary>User information with no extra sub-items.</summary>
    public UserInformation(uint maxPduLength, string? implementationClassUid, string? implementationVersionName)
        : this(maxPduLength, implementationClassUid, implementationVersionName, []) { }
}

/// <summary>A presentation context proposed in an A-ASSOCIATE-RQ (PS3.8 9.3.2.2): id (odd, 1-255), abstract syntax, transfer syntaxes.</summary>
public sealed record PresentationContextProposal(byte Id, string AbstractSyntax, IReadOnlyList<string> TransferSyntaxes);

/// <summary>Result/reason of a presentation context in an A-ASSOCIATE-AC (PS3.8 9.3.3.2, table 9-18).</summary>
public enum PresentationContextResult : byte
{
    Acceptance = 0,
    UserRejection = 1,
    NoReason = 2,
    AbstractSyntaxNotSupported = 3,
    TransferSyntaxesNotSupported = 4,
}

/// <summary>The answer to one proposed presentation context (PS3.8 9.3.3.2); the transfer syntax is significant only when accepted.</summary>
public sealed record PresentationContextAnswer(byte Id, PresentationContextResult Result, string TransferSyntax);

/// <summary>A-ASSOCIATE-RQ (PS3.8 9.3.2). AE titles are trimmed of their space padding.</summary>
public sealed record AssociateRequestPdu(string CalledAe, string CallingAe, string ApplicationContext,
    IReadOnlyList<PresentationContextProposal> Contexts, UserInformation User, ushort ProtocolVersion = 1) : Pdu
{
    public override PduType Type => PduType.AssociateRequest;
}

/// <summary>A-ASSOCIATE-AC (PS3.8 9.3.3); the AE title fields repeat the request's.</summary>
public sealed record AssociateAcceptPdu(string CalledAe, string CallingAe, string ApplicationContext,
    IReadOnlyList<PresentationContextAnswer> Contexts, UserInformation User, ushort ProtocolVersion = 1) : Pdu
{
    public override PduType Type => PduType.AssociateAccept;
}

/// <summary>A-ASSOCIATE-RJ (PS3.8 9.3.4, table 9-21): result 1 permanent / 2 transient, source, reason.</summary>
public sealed record AssociateRejectPdu(byte Result, byte Source, byte Reason) : Pdu
{
    public override PduType Type => PduType.AssociateReject;

    /// <summary>Result: rejected-permanent.</summary>
    public const byte Permanent = 1;

    /// <summary>Result: rejected-transient.</summary>
    public const byte Transient = 2;

    /// <summary>Source 1, DICOM UL service-user; reasons 1 no-reason-given, 2 application-context-name-not-supported, 3 calling-AE-title-not-recognized, 7 called-AE-title-not-recognized.</summary>
    public const byte SourceServiceUser = 1;

    /// <summary>Source 2, DICOM UL service-provider (ACSE); reasons 1 no-reason-given, 2 protocol-version-not-supported.</summary>
    public const byte SourceServiceProviderAcse = 2;

    /// <summary>Source 3, DICOM UL service-provider (presentation); reasons 1 temporary-congestion, 2 local-limit-exceeded.</summary>
    public const byte SourceServiceProviderPresentation = 3;

    /// <summary>Rejected because the called AE title is not ours (source 1, reason 7).</summary>
    public static AssociateRejectPdu CalledAeNotRecognized => new(Permanent, SourceServiceUser, 7);

    /// <summary>Rejected because the calling AE title is not allowed (source 1, reason 3).</summary>
    public static AssociateRejectPdu CallingAeNotRecognized => new(Permanent, SourceServiceUser, 3);

    /// <summary>Rejected because the application context is not the DICOM one (source 1, reason 2).</summary>
    public static AssociateRejectPdu ApplicationContextNotSupported => new(Permanent, SourceServiceUser, 2);

    /// <summary>Rejected because the protocol version is not supported (source 2, reason 2).</summary>
    public static AssociateRejectPdu ProtocolVersionNotSupported => new(Permanent, SourceServiceProviderAcse, 2);

    /// <summary>Rejected because too many associations are open (transient, source 3, reason 2 local-limit-exceeded).</summary>
    public static AssociateRejectPdu LocalLimitExceeded => new(Transient, SourceServiceProviderPresentation, 2);

    /// <summary>Rejected for no stated reason (source 1, reason 1), e.g. a malformed request.</summary>
    public static AssociateRejectPdu NoReasonGiven => new(Permanent, SourceServiceUser, 1);
}

/// <summary>
/// One presentation data value (PS3.8 9.3.5.1, annex E.2): context id, the message control header's two flags
/// (bit 0: command, bit 1: last fragment) and the fragment.
/// </summary>
public readonly record struct Pdv(byte ContextId, bool IsCommand, bool IsLast, ReadOnlyMemory<byte> Data);

/// <summary>P-DATA-TF (PS3.8 9.3.5): one or more presentation data values.</summary>
public sealed record PDataPdu(IReadOnlyList<Pdv> Values) : Pdu
{
    public override PduType Type => PduType.PData;
}

/// <summary>A-RELEASE-RQ (PS3.8 9.3.6).</summary>
public sealed record ReleaseRequestPdu : Pdu
{
    public override PduType Type => PduType.ReleaseRequest;
}

/// <summary>A-RELEASE-RP (PS3.8 9.3.7).</summary>
public sealed record ReleaseResponsePdu : Pdu
{
    public override PduType Type => PduType.ReleaseResponse;
}

/// <summary>
/// A-ABORT (PS3.8 9.3.8, table 9-26): source 0 service-user, 2 service-provider; reason (provider only)
/// 0 not specified, 1 unrecognized PDU, 2 unexpected PDU, 4 unrecognized PDU parameter, 5 unexpected PDU parameter,
/// 6 invalid PDU parameter value.
/// </summary>
public sealed record AbortPdu(byte Source, byte Reason) : Pdu
{
    public override PduType Type => PduType.Abort;

    /// <summary>Source: service user.</summary>
    public const byte SourceServiceUser = 0;

    /// <summary>Source: service provider.</summary>
    public const byte SourceServiceProvider = 2;
}

/// <summary>A-ABORT reasons of the service provider (PS3.8 table 9-26).</summary>
public static class AbortReason
{
    public const byte NotSpecified = 0;
    public const byte UnrecognizedPdu = 1;
    public const byte UnexpectedPdu = 2;
    public const byte UnrecognizedPduParameter = 4;
    public const byte UnexpectedPduParameter = 5;
    public const byte InvalidPduParameterValue = 6;
}
