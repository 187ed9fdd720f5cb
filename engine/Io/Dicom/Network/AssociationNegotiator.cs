namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// Decides the answer to an A-ASSOCIATE-RQ (PS3.8 7.1, 9.3.2): rejection for a wrong protocol version, application
/// context or AE title, otherwise acceptance with one answer per proposed presentation context.
/// </summary>
public static class AssociationNegotiator
{
    /// <summary>The accept or reject PDU, and a reason for the log when rejected.</summary>
    public static (Pdu Answer, string? Refusal) Answer(AssociateRequestPdu rq, StorageScpOptions options)
    {
        // PS3.8 9.3.2: bit 0 of the protocol version field is version 1, the only one defined.
        if ((rq.ProtocolVersion & 1) == 0) return (AssociateRejectPdu.ProtocolVersionNotSupported, $"protocol version 0x{rq.ProtocolVersion:X4}");
        if (rq.ApplicationContext != PduCodec.DicomApplicationContext)
            return (AssociateRejectPdu.ApplicationContextNotSupported, $"application context {rq.ApplicationContext}");
        if (options.CheckCalledAeTitle && !string.Equals(rq.CalledAe, options.AeTitle.Trim(), StringComparison.Ordinal))
            return (AssociateRejectPdu.CalledAeNotRecognized, $"called AE title '{rq.CalledAe}' is not '{options.AeTitle.Trim()}'");
        if (options.AllowedCallingAeTitles.Count > 0 && !options.AllowedCallingAeTitles.Any(a => a.Trim() == rq.CallingAe))
            return (AssociateRejectPdu.CallingAeNotRecognized, $"calling AE title '{rq.CallingAe}' is not allowed");
        var answers = rq.Contexts.Select(pc => AnswerContext(pc, options)).ToList();
        var user = new UserInformation(options.MaxPduLength, Writing.DicomUids.ImplementationClassUid, Writing.DicomUids.ImplementationVersionName);
        return (new AssociateAcceptPdu(rq.CalledAe, rq.CallingAe, PduCodec.DicomApplicationContext, answers, user), null);
    }

    /// <summary>
    /// One presentation context: the abstract syntax must be accepted; the transfer syntax is the first proposed one
    /// that is accepted, so the requester's order of preference decides (PS3.8 9.3.2.2).
    /// </summary>
    public static PresentationContextAnswer AnswerContext(PresentationContextProposal pc, StorageScpOptions options)
    {
        // PS3.8 9.3.2.2: context ids are odd numbers 1-255.
        if (pc.Id % 2 == 0) return new(pc.Id, PresentationContextResult.NoReason, pc.TransferSyntaxes[0]);
        if (!options.AbstractSyntaxes.Contains(pc.AbstractSyntax))
            return new(pc.Id, PresentationContextResult.AbstractSyntaxNotSupported, pc.TransferSyntaxes[0]);
        var ts = pc.TransferSyntaxes.FirstOrDefault(options.TransferSyntaxes.Contains);
        return ts is null
            ? new(pc.Id, PresentationContextResult.TransferSyntaxesNotSupported, pc.TransferSyntaxes[0])
            : new(pc.Id, PresentationContextResult.Acceptance, ts);
    }
}
