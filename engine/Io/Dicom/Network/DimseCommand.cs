using System.Buffers.Binary;
using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// A DIMSE command set (PS3.7 section 9.3 and annex E): group 0000 elements, always Implicit VR Little Endian
/// whatever the presentation context's transfer syntax, starting with Command Group Length (0000,0000).
/// </summary>
public sealed record DimseCommand
{
    /// <summary>Command Data Set Type (0000,0800) value meaning "no data set follows" (PS3.7 E.1).</summary>
    public const ushort NoDataSet = 0x0101;

    public const ushort CStoreRequest = 0x0001, CStoreResponse = 0x8001, CEchoRequest = 0x0030, CEchoResponse = 0x8030;

    /// <summary>Command Field (0000,0100).</summary>
    public ushort CommandField { get; init; }

    /// <summary>Message ID (0000,0110), requests only.</summary>
    public ushort? MessageId { get; init; }

    /// <summary>Message ID Being Responded To (0000,0120), responses only.</summary>
    public ushort? MessageIdBeingRespondedTo { get; init; }

    /// <summary>Affected SOP Class UID (0000,0002).</summary>
    public string? AffectedSopClassUid { get; init; }

    /// <summary>Affected SOP Instance UID (0000,1000).</summary>
    public string? AffectedSopInstanceUid { get; init; }

    /// <summary>Priority (0000,0700): 0 medium, 1 high, 2 low.</summary>
    public ushort? Priority { get; init; }

    /// <summary>Command Data Set Type (0000,0800).</summary>
    public ushort DataSetType { get; init; } = NoDataSet;

    /// <summary>Status (0000,0900), responses only.</summary>
    public ushort? Status { get; init; }

    /// <summary>Error Comment (0000,0902), at most 64 characters.</summary>
    public string? ErrorComment { get; init; }

    /// <summary>Move Originator Application Entity Title (0000,1030).</summary>
    public string? MoveOriginatorAe { get; init; }

    /// <summary>Move Originator Message ID (0000,1031).</summary>
    public ushort? MoveOriginatorMessageId { get; init; }

    /// <summary>True when a data set follows the command.</summary>
    public bool HasDataSet => DataSetType != NoDataSet;

    /// <summary>True for request commands (bit 15 of the command field clear).</summary>
    public bool IsRequest => (CommandField & 0x8000) == 0;

    /// <summary>The response to this request with <paramref name="status"/> (PS3.7 9.3: same SOP class and instance, no data set).</summary>
    public DimseCommand Response(ushort status, string? errorComment = null) => new()
    {
        CommandField = (ushort)(CommandField | 0x8000), MessageIdBeingRespondedTo = MessageId,
        AffectedSopClassUid = AffectedSopClassUid, AffectedSopInstanceUid = AffectedSopInstanceUid,
        Status = status, ErrorComment = errorComment is { Length: > 64 } ? errorComment[..64] : errorComment,
    };

    /// <summary>The command set as Implicit VR Little Endian bytes, elements in ascending tag order, group length first.</summary>
    public byte[] Encode()
    {
        var body = new MemoryStream();
        Text(body, 0x0002, AffectedSopClassUid, uid: true);
        U16(body, 0x0100, CommandField);
        U16(body, 0x0110, MessageId);
        U16(body, 0x0120, MessageIdBeingRespondedTo);
        U16(body, 0x0700, Priority);
        U16(body, 0x0800, DataSetType);
        U16(body, 0x0900, Status);
        Text(body, 0x0902, ErrorComment, uid: false);
        Text(body, 0x1000, AffectedSopInstanceUid, uid: true);
        Text(body, 0x1030, MoveOriginatorAe, uid: false);
        U16(body, 0x1031, MoveOriginatorMessageId);
        var result = new byte[12 + body.Length];
        Header(result, 0x0000, 4);
        BinaryPrimitives.WriteUInt32LittleEndian(result.AsSpan(8), (uint)body.Length);
        body.ToArray().CopyTo(result, 12);
        return result;
    }

    private static void Header(Span<byte> h, ushort element, uint length)
    {
        BinaryPrimitives.WriteUInt16LittleEndian(h, 0x0000);
        BinaryPrimitives.WriteUInt16LittleEndian(h[2..], element);
        BinaryPrimitives.WriteUInt32LittleEndian(h[4..], length);
    }

    private static void U16(Stream s, ushort element, ushort? value)
    {
        if (value is not { } v) return;
        Span<byte> b = stackalloc byte[10];
        Header(b, element, 2);
        BinaryPrimitives.WriteUInt16LittleEndian(b[8..], v);
        s.Write(b);
    }

    private static void Text(Stream s, ushort element, string? value, bool uid)
    {
        if (value is null) return;
        var bytes = Encoding.ASCII.GetBytes(value);
        if (bytes.Length % 2 == 1) bytes = [.. bytes, uid ? (byte)0 : (byte)' '];
        Span<byte> h = stackalloc byte[8];
        Header(h, element, (uint)bytes.Length);
        s.Write(h);
        s.Write(bytes);
    }

    /// <summary>Decodes a command set; a malformed one is a <see cref="DicomProtocolException"/>.</summary>
    public static DimseCommand Decode(ReadOnlyMemory<byte> bytes)
    {
        DicomDataset ds;
        try
        {
            var log = new DicomReadLog(DicomReadOptions.Default, "DIMSE command set");
            ds = new DicomParser(bytes, log, false).ParseDataset(DicomEncoding.ImplicitLittle);
        }
        catch (InputException e)
        {
            throw new DicomProtocolException("the DIMSE command set is malformed: " + e.Message, AbortReason.InvalidPduParameterValue);
        }
        if (ds.Elements.Any(e => e.Tag.Group != 0x0000))
            throw new DicomProtocolException("the DIMSE command set holds elements outside group 0000", AbortReason.InvalidPduParameterValue);
        if (ds.GetIntOrNull(DicomTags.CommandField) is not { } field)
            throw new DicomProtocolException("the DIMSE command set has no Command Field (0000,0100)", AbortReason.InvalidPduParameterValue);
        return new DimseCommand
        {
            CommandField = (ushort)field,
            MessageId = U16(ds, DicomTags.MessageID),
            MessageIdBeingRespondedTo = U16(ds, DicomTags.MessageIDBeingRespondedTo),
            AffectedSopClassUid = ds.GetStringOrNull(DicomTags.AffectedSOPClassUID),
            AffectedSopInstanceUid = ds.GetStringOrNull(DicomTags.AffectedSOPInstanceUID),
            Priority = U16(ds, DicomTags.Priority),
            DataSetType = U16(ds, DicomTags.CommandDataSetType) ?? NoDataSet,
            Status = U16(ds, DicomTags.Status),
            ErrorComment = ds.GetStringOrNull(DicomTags.ErrorComment),
            MoveOriginatorAe = ds.GetStringOrNull(DicomTags.MoveOriginatorApplicationEntityTitle),
            MoveOriginatorMessageId = U16(ds, DicomTags.MoveOriginatorMessageID),
        };
    }

    private static ushort? U16(DicomDataset ds, DicomTag tag) => ds.GetIntOrNull(tag) is { } v ? (ushort)v : null;
}

/// <summary>DIMSE status codes used by this side (PS3.7 annex C, PS3.4 B.2.3 for C-STORE).</summary>
public static class DimseStatus
{
    /// <summary>Success.</summary>
    public const ushort Success = 0x0000;

    /// <summary>Refused: SOP class not supported (PS3.7 C.5.4).</summary>
    public const ushort SopClassNotSupported = 0x0122;

    /// <summary>Unrecognized operation (PS3.7 C.5.7).</summary>
    public const ushort UnrecognizedOperation = 0x0211;

    /// <summary>C-STORE refused: out of resources (PS3.4 B.2.3).</summary>
    public const ushort OutOfResources = 0xA700;

    /// <summary>C-STORE error: data set does not match SOP class (PS3.4 B.2.3).</summary>
    public const ushort DataSetDoesNotMatchSopClass = 0xA900;

    /// <summary>C-STORE error: cannot understand (PS3.4 B.2.3).</summary>
    public const ushort CannotUnderstand = 0xC000;
}
