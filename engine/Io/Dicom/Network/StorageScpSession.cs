namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// One association of the storage SCP on one connection, following the acceptor side of the PS3.8 state machine
/// (9.2): A-ASSOCIATE-RQ within the ARTIM time, then P-DATA-TF carrying DIMSE messages (C-ECHO, C-STORE; PS3.7 9.1)
/// until A-RELEASE-RQ or A-ABORT. Any malformed, unexpected or oversized PDU ends the association with A-ABORT;
/// nothing a peer sends escapes as an exception.
/// </summary>
internal sealed class StorageScpSession(Stream stream, StorageScpOptions options, IStorageScpHandler handler, string peer)
{
    private const int MaxCommandBytes = 1 << 16;
    private readonly PduChannel _channel = new(stream, options.MaxPduLength);
    private readonly Dictionary<byte, (string AbstractSyntax, string TransferSyntax)> _contexts = [];
    private readonly List<ReceivedInstance> _stored = [];
    private readonly MemoryStream _command = new();
    private string? _callingAe, _calledAe;
    private uint _peerMaxPdu;
    private int _failed;

    // The message whose data set is arriving: a C-STORE (Instance) or another request whose data is skipped.
    private byte _dataContext;
    private DimseCommand? _awaitingData;
    private IncomingInstance? _instance;

    /// <summary>Runs the association to its end; <paramref name="busy"/> answers the request with a transient rejection.</summary>
    public async Task<AssociationSummary> RunAsync(bool busy, CancellationToken ct)
    {
        try
        {
            return await RunCore(busy, ct);
        }
        catch (DicomProtocolException e)
        {
            await TryAbort(e.AbortReason, ct);
            return Summary(AssociationEnd.Aborted, e.Message);
        }
        catch (TimeoutException e)
        {
            await TryAbort(AbortReason.NotSpecified, ct);
            return Summary(AssociationEnd.TimedOut, e.Message);
        }
        catch (OperationCanceledException) when (ct.IsCancellationRequested)
        {
            await TryAbort(AbortReason.NotSpecified, CancellationToken.None);
            return Summary(AssociationEnd.Stopped, "the receiver is stopping");
        }
        catch (IOException)
        {
            return Summary(AssociationEnd.ConnectionLost, "the connection failed");
        }
        finally
        {
            if (_instance is not null) await _instance.DisposeAsync();
        }
    }

    private async Task<AssociationSummary> RunCore(bool busy, CancellationToken ct)
    {
        var first = await _channel.ReadAsync(options.ArtimTimeout, ct);
        if (first is null) return Summary(AssociationEnd.ConnectionLost, "closed before any PDU");
        if (first is not AssociateRequestPdu rq)
            throw new DicomProtocolException($"expected A-ASSOCIATE-RQ, got {first.Type}", AbortReason.UnexpectedPdu);
        (_callingAe, _calledAe, _peerMaxPdu) = (rq.CallingAe, rq.CalledAe, rq.User.MaxPduLength);
        var (answer, refusal) = busy
            ? (AssociateRejectPdu.LocalLimitExceeded, $"more than {options.MaxAssociations} associations at once")
            : AssociationNegotiator.Answer(rq, options);
        await _channel.WriteAsync(answer, options.ArtimTimeout, ct);
        if (refusal is not null)
        {
            await AwaitClose(ct);
            return Summary(AssociationEnd.Rejected, refusal);
        }
        foreach (var (p, a) in rq.Contexts.Zip(((AssociateAcceptPdu)answer).Contexts))
            if (a.Result == PresentationContextResult.Acceptance) _contexts.TryAdd(p.Id, (p.AbstractSyntax, a.TransferSyntax));
        return await Serve(ct);
    }

    private async Task<AssociationSummary> Serve(CancellationToken ct)
    {
        while (true)
        {
            switch (await _channel.ReadAsync(options.IdleTimeout, ct))
            {
                case null: return Summary(AssociationEnd.ConnectionLost, "the peer closed the connection without A-RELEASE-RQ");
                case PDataPdu pd:
                    foreach (var v in pd.Values) await OnPdv(v, ct);
                    break;
                case ReleaseRequestPdu:
                    if (_awaitingData is not null) throw new DicomProtocolException("A-RELEASE-RQ in the middle of a data set", AbortReason.UnexpectedPdu);
                    await _channel.WriteAsync(new ReleaseResponsePdu(), options.ArtimTimeout, ct);
                    await AwaitClose(ct);
                    return Summary(AssociationEnd.Released, null);
                case AbortPdu ab: return Summary(AssociationEnd.AbortedByPeer, $"A-ABORT from the peer (source {ab.Source}, reason {ab.Reason})");
                case var other: throw new DicomProtocolException($"unexpected {other.Type} inside an association", AbortReason.UnexpectedPdu);
            }
        }
    }

    private async Task OnPdv(Pdv v, CancellationToken ct)
    {
        if (!_contexts.ContainsKey(v.ContextId))
            throw new DicomProtocolException($"PDV on presentation context {v.ContextId}, which was not accepted", AbortReason.InvalidPduParameterValue);
        if (v.IsCommand)
        {
            if (_awaitingData is not null) throw new DicomProtocolException("command fragment while a data set is incomplete", AbortReason.UnexpectedPduParameter);
            if (_command.Length + v.Data.Length > MaxCommandBytes)
                throw new DicomProtocolException($"DIMSE command set longer than {MaxCommandBytes} bytes", AbortReason.InvalidPduParameterValue);
            _command.Write(v.Data.Span);
            if (!v.IsLast) return;
            var command = DimseCommand.Decode(_command.ToArray());
            _command.SetLength(0);
            await OnCommand(command, v.ContextId, ct);
            return;
        }
        if (_awaitingData is null || v.ContextId != _dataContext)
            throw new DicomProtocolException("data fragment without a command that announced it", AbortReason.UnexpectedPduParameter);
        if (_instance is not null) await _instance.AppendAsync(v.Data, ct);
        if (v.IsLast) await OnDataComplete(ct);
    }

    private async Task OnCommand(DimseCommand c, byte contextId, CancellationToken ct)
    {
        if (!c.IsRequest) throw new DicomProtocolException($"unexpected DIMSE response 0x{c.CommandField:X4} sent to the SCP", AbortReason.UnexpectedPduParameter);
        var (abstractSyntax, transferSyntax) = _contexts[contextId];
        if (c.CommandField == DimseCommand.CStoreRequest && c.HasDataSet)
            _instance = new IncomingInstance(c, abstractSyntax, transferSyntax, options);
        if (c.HasDataSet)
        {
            (_awaitingData, _dataContext) = (c, contextId);
            return;
        }
        var response = c.CommandField switch
        {
            DimseCommand.CEchoRequest => c.Response(DimseStatus.Success),
            DimseCommand.CStoreRequest => c.Response(DimseStatus.CannotUnderstand, "C-STORE-RQ without a data set"),
            _ => c.Response(DimseStatus.UnrecognizedOperation, "this SCP answers C-ECHO and C-STORE only"),
        };
        await Respond(response, contextId, ct);
    }

    private async Task OnDataComplete(CancellationToken ct)
    {
        var c = _awaitingData!;
        _awaitingData = null;
        DimseCommand response;
        if (_instance is { } inst)
        {
            _instance = null;
            await using (inst)
            {
                var (rsp, stored) = await inst.CompleteAsync(handler);
                if (stored is not null) _stored.Add(stored);
                response = rsp;
            }
        }
        else response = c.Response(DimseStatus.UnrecognizedOperation, "this SCP answers C-ECHO and C-STORE only");
        if (response.Status != DimseStatus.Success) _failed++;
        await Respond(response, _dataContext, ct);
    }

    /// <summary>Sends a command set in P-DATA-TF PDUs no longer than the peer's maximum (PS3.8 9.3.5, D.1).</summary>
    private async Task Respond(DimseCommand response, byte contextId, CancellationToken ct)
    {
        var bytes = response.Encode();
        int chunk = _peerMaxPdu is 0 or > 1 << 20 ? 1 << 16 : Math.Max(1, (int)_peerMaxPdu - 6);
        for (int at = 0; at < bytes.Length; at += chunk)
        {
            int n = Math.Min(chunk, bytes.Length - at);
            var pdv = new Pdv(contextId, IsCommand: true, IsLast: at + n == bytes.Length, bytes.AsMemory(at, n));
            await _channel.WriteAsync(new PDataPdu([pdv]), options.IdleTimeout, ct);
        }
    }

    /// <summary>After A-ASSOCIATE-RJ, A-RELEASE-RP or A-ABORT the peer closes the connection; ARTIM bounds the wait (PS3.8 9.1.5).</summary>
    private async Task AwaitClose(CancellationToken ct)
    {
        try
        {
            while (await _channel.ReadAsync(options.ArtimTimeout, ct) is not null) { }
        }
        catch (Exception e) when (e is DicomProtocolException or TimeoutException or IOException or OperationCanceledException)
        {
            // Whatever the peer does now, the association is over: the caller closes the connection.
        }
    }

    private async Task TryAbort(byte reason, CancellationToken ct)
    {
        try
        {
            await _channel.WriteAsync(new AbortPdu(AbortPdu.SourceServiceProvider, reason), TimeSpan.FromSeconds(5), ct);
        }
        catch (Exception e) when (e is IOException or TimeoutException or OperationCanceledException or ObjectDisposedException)
        {
            // The peer is gone or not reading: the A-ABORT is a courtesy (PS3.8 9.1.6), closing the connection ends it anyway.
        }
    }

    private AssociationSummary Summary(AssociationEnd end, string? problem) =>
        new(peer, _callingAe, _calledAe, end, problem, _stored.ToList(), _failed);
}
