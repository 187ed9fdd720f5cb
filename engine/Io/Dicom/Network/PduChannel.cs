using System.Buffers.Binary;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// Reads and writes whole PDUs on a transport stream with a time limit per operation. A PDU whose length field
/// exceeds the accepted maximum is refused before its body is read (no allocation from the peer's number).
/// </summary>
public sealed class PduChannel(Stream stream, uint maxPduLength)
{
    /// <summary>Reads the next PDU; null when the peer closed the connection cleanly between PDUs.</summary>
    /// <exception cref="DicomProtocolException">malformed, unknown or oversized PDU.</exception>
    /// <exception cref="TimeoutException">nothing (or not all of it) arrived within <paramref name="timeout"/>.</exception>
    public async Task<Pdu?> ReadAsync(TimeSpan timeout, CancellationToken ct)
    {
        using var cts = CancellationTokenSource.CreateLinkedTokenSource(ct);
        cts.CancelAfter(timeout);
        try
        {
            var header = new byte[PduCodec.HeaderLength];
            int got = await ReadFully(header, cts.Token);
            if (got == 0) return null;
            if (got < header.Length) throw new DicomProtocolException("the connection closed inside a PDU header", AbortReason.NotSpecified);
            byte type = header[0];
            if (!PduCodec.IsKnownType(type)) throw new DicomProtocolException($"unrecognised PDU type 0x{type:X2}", AbortReason.UnrecognizedPdu);
            uint length = BinaryPrimitives.ReadUInt32BigEndian(header.AsSpan(2));
            if (length > maxPduLength)
                throw new DicomProtocolException($"PDU of type 0x{type:X2} announces {length:N0} bytes, more than the {maxPduLength:N0} accepted",
                    AbortReason.InvalidPduParameterValue);
            var body = new byte[length];
            if (await ReadFully(body, cts.Token) < body.Length)
                throw new DicomProtocolException("the connection closed inside a PDU", AbortReason.NotSpecified);
            return PduCodec.Decode(type, body);
        }
        catch (OperationCanceledException) when (!ct.IsCancellationRequested)
        {
            throw new TimeoutException($"no complete PDU within {timeout.TotalSeconds:0.#} s");
        }
    }

    /// <summary>Writes one PDU.</summary>
    public async Task WriteAsync(Pdu pdu, TimeSpan timeout, CancellationToken ct)
    {
        using var cts = CancellationTokenSource.CreateLinkedTokenSource(ct);
        cts.CancelAfter(timeout);
        try
        {
            await stream.WriteAsync(PduCodec.Encode(pdu), cts.Token);
            await stream.FlushAsync(cts.Token);
        }
        catch (OperationCanceledException) when (!ct.IsCancellationRequested)
        {
            throw new TimeoutException($"the peer did not take a PDU within {timeout.TotalSeconds:0.#} s");
        }
    }

    private async Task<int> ReadFully(byte[] buffer, CancellationToken ct)
    {
        int total = 0;
        while (total < buffer.Length)
        {
            int n = await stream.ReadAsync(buffer.AsMemory(total), ct);
            if (n == 0) break;
            total += n;
        }
        return total;
    }
}
