using System.Buffers.Binary;
using System.Text;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// Encodes and decodes PDUs (PS3.8 section 9.3): 6-byte header (type, reserved, 32-bit big-endian length), then the
/// variable field. Items inside A-ASSOCIATE PDUs have a 4-byte header (type, reserved, 16-bit length). Every length is
/// checked against the bytes that remain before anything is sliced; a violation is a <see cref="DicomProtocolException"/>.
/// </summary>
public static class PduCodec
{
    /// <summary>The DICOM application context name (PS3.7 annex A.2.1).</summary>
    public const string DicomApplicationContext = "1.2.840.10008.3.1.1.1";

    /// <summary>Size of the PDU header.</summary>
    public const int HeaderLength = 6;

    private const byte ItemApplicationContext = 0x10, ItemContextRequest = 0x20, ItemContextAccept = 0x21,
        ItemAbstractSyntax = 0x30, ItemTransferSyntax = 0x40, ItemUserInformation = 0x50,
        SubItemMaxLength = 0x51, SubItemImplementationClass = 0x52, SubItemImplementationVersion = 0x55;

    /// <summary>The whole PDU (header and variable field).</summary>
    public static byte[] Encode(Pdu pdu)
    {
        var w = new BigEndianWriter();
        w.U8((byte)pdu.Type);
        w.U8(0);
        int lengthAt = w.Reserve(4);
        switch (pdu)
        {
            case AssociateRequestPdu rq: WriteAssociate(w, rq.ProtocolVersion, rq.CalledAe, rq.CallingAe, rq.ApplicationContext, rq.User,
                iw => { foreach (var pc in rq.Contexts) WriteProposal(iw, pc); }); break;
            case AssociateAcceptPdu ac: WriteAssociate(w, ac.ProtocolVersion, ac.CalledAe, ac.CallingAe, ac.ApplicationContext, ac.User,
                iw => { foreach (var pc in ac.Contexts) WriteAnswer(iw, pc); }); break;
            case AssociateRejectPdu rj: w.U8(0); w.U8(rj.Result); w.U8(rj.Source); w.U8(rj.Reason); break;
            case PDataPdu pd: foreach (var v in pd.Values) WritePdv(w, v); break;
            case ReleaseRequestPdu or ReleaseResponsePdu: w.U32(0); break;
            case AbortPdu ab: w.U8(0); w.U8(0); w.U8(ab.Source); w.U8(ab.Reason); break;
            default: throw new ArgumentException($"unknown PDU {pdu.GetType().Name}", nameof(pdu));
        }
        w.PatchU32(lengthAt, checked((uint)(w.Length - HeaderLength)));
        return w.ToArray();
    }

    /// <summary>Length of the P-DATA-TF PDU that carries <paramref name="fragmentLength"/> bytes in one PDV (PS3.8 9.3.5).</summary>
    public static uint PDataLengthFor(int fragmentLength) => (uint)(4 + 2 + fragmentLength);

    private static void WriteAssociate(BigEndianWriter w, ushort version, string called, string calling, string appContext,
        UserInformation user, Action<BigEndianWriter> contexts)
    {
        w.U16(version);
        w.U16(0);
        w.Bytes(AeField(called));
        w.Bytes(AeField(calling));
        w.Bytes(new byte[32]);
        WriteItem(w, ItemApplicationContext, iw => iw.Ascii(appContext));
        contexts(w);
        WriteItem(w, ItemUserInformation, iw =>
        {
            WriteItem(iw, SubItemMaxLength, s => s.U32(user.MaxPduLength));
            if (user.ImplementationClassUid is { } c) WriteItem(iw, SubItemImplementationClass, s => s.Ascii(c));
            foreach (var o in user.Others) WriteItem(iw, o.ItemType, s => s.Bytes(o.Value));
            if (user.ImplementationVersionName is { } v) WriteItem(iw, SubItemImplementationVersion, s => s.Ascii(v));
        });
    }

    private static void WriteProposal(BigEndianWriter w, PresentationContextProposal pc) => WriteItem(w, ItemContextRequest, iw =>
    {
        iw.U8(pc.Id); iw.U8(0); iw.U8(0); iw.U8(0);
        WriteItem(iw, ItemAbstractSyntax, s => s.Ascii(pc.AbstractSyntax));
        foreach (var ts in pc.TransferSyntaxes) WriteItem(iw, ItemTransferSyntax, s => s.Ascii(ts));
    });

    private static void WriteAnswer(BigEndianWriter w, PresentationContextAnswer pc) => WriteItem(w, ItemContextAccept, iw =>
    {
        iw.U8(pc.Id); iw.U8(0); iw.U8((byte)pc.Result); iw.U8(0);
        WriteItem(iw, ItemTransferSyntax, s => s.Ascii(pc.TransferSyntax));
    });

    private static void WriteItem(BigEndianWriter w, byte type, Action<BigEndianWriter> body)
    {
        w.U8(type);
        w.U8(0);
        int at = w.Reserve(2);
        int start = w.Length;
        body(w);
        w.PatchU16(at, checked((ushort)(w.Length - start)));
    }

    private static void WritePdv(BigEndianWriter w, Pdv v)
    {
        w.U32(checked((uint)(v.Data.Length + 2)));
        w.U8(v.ContextId);
        w.U8((byte)((v.IsCommand ? 1 : 0) | (v.IsLast ? 2 : 0)));
        w.Bytes(v.Data.Span);
    }

    /// <summary>An AE title field: 16 bytes, space padded (PS3.8 9.3.2, PS3.5 AE).</summary>
    private static byte[] AeField(string ae)
    {
        var b = Enumerable.Repeat((byte)' ', 16).ToArray();
        Encoding.ASCII.GetBytes(ae.Length > 16 ? ae[..16] : ae).CopyTo(b, 0);
        return b;
    }

    /// <summary>Decodes the variable field <paramref name="body"/> of a PDU of type <paramref name="type"/>.</summary>
    public static Pdu Decode(byte type, ReadOnlyMemory<byte> body) => type switch
    {
        (byte)PduType.AssociateRequest => DecodeAssociate(body, request: true),
        (byte)PduType.AssociateAccept => DecodeAssociate(body, request: false),
        (byte)PduType.AssociateReject => Fixed4(body, "A-ASSOCIATE-RJ", b => new AssociateRejectPdu(b[1], b[2], b[3])),
        (byte)PduType.PData => DecodePData(body),
        (byte)PduType.ReleaseRequest => Fixed4(body, "A-RELEASE-RQ", _ => new ReleaseRequestPdu()),
        (byte)PduType.ReleaseResponse => Fixed4(body, "A-RELEASE-RP", _ => new ReleaseResponsePdu()),
        (byte)PduType.Abort => Fixed4(body, "A-ABORT", b => new AbortPdu(b[2], b[3])),
        _ => throw new DicomProtocolException($"unrecognised PDU type 0x{type:X2}", AbortReason.UnrecognizedPdu),
    };

    /// <summary>True when <paramref name="type"/> is one of the seven PDU types of PS3.8.</summary>
    public static bool IsKnownType(byte type) => type is >= 0x01 and <= 0x07;

    private static Pdu Fixed4(ReadOnlyMemory<byte> body, string name, Func<byte[], Pdu> make) =>
        body.Length == 4 ? make(body.ToArray())
        : throw new DicomProtocolException($"{name} has length {body.Length}, expected 4", AbortReason.InvalidPduParameterValue);

    private static PDataPdu DecodePData(ReadOnlyMemory<byte> body)
    {
        var list = new List<Pdv>();
        var s = body.Span;
        int pos = 0;
        while (pos < body.Length)
        {
            if (body.Length - pos < 6) throw Invalid("P-DATA-TF ends inside a PDV item header");
            uint len = BinaryPrimitives.ReadUInt32BigEndian(s[pos..]);
            if (len < 2 || len > body.Length - pos - 4) throw Invalid($"PDV item length {len} does not fit the PDU");
            byte id = s[pos + 4], mch = s[pos + 5];
            if ((mch & 0xFC) != 0) throw Invalid($"PDV message control header 0x{mch:X2} sets reserved bits");
            list.Add(new Pdv(id, (mch & 1) != 0, (mch & 2) != 0, body.Slice(pos + 6, (int)len - 2)));
            pos += 4 + (int)len;
        }
        if (list.Count == 0) throw Invalid("P-DATA-TF holds no PDV item");
        return new PDataPdu(list);
    }

    private static Pdu DecodeAssociate(ReadOnlyMemory<byte> body, bool request)
    {
        string name = request ? "A-ASSOCIATE-RQ" : "A-ASSOCIATE-AC";
        if (body.Length < 68) throw Invalid($"{name} has {body.Length} bytes, fewer than its 68-byte fixed part");
        var s = body.Span;
        ushort version = BinaryPrimitives.ReadUInt16BigEndian(s);
        string called = AeText(s.Slice(4, 16)), calling = AeText(s.Slice(20, 16));
        string? appContext = null;
        var proposals = new List<PresentationContextProposal>();
        var answers = new List<PresentationContextAnswer>();
        UserInformation? user = null;
        foreach (var (type, value) in Items(body[68..], name))
        {
            switch (type)
            {
                case ItemApplicationContext: appContext = Uid(value.Span); break;
                case ItemContextRequest when request: proposals.Add(DecodeProposal(value)); break;
                case ItemContextAccept when !request: answers.Add(DecodeAnswer(value)); break;
                case ItemUserInformation: user = DecodeUser(value); break;
                case ItemContextRequest or ItemContextAccept:
                    throw new DicomProtocolException($"{name} holds a presentation context item of type 0x{type:X2}", AbortReason.UnexpectedPduParameter);
                default: break; // PS3.8 9.3.1: items of unrecognised type are ignored
            }
        }
        if (appContext is null) throw Invalid($"{name} has no application context item");
        if (user is null) throw Invalid($"{name} has no user information item");
        return request
            ? new AssociateRequestPdu(called, calling, appContext, proposals, user, version)
            : new AssociateAcceptPdu(called, calling, appContext, answers, user, version);
    }

    private static PresentationContextProposal DecodeProposal(ReadOnlyMemory<byte> v)
    {
        if (v.Length < 4) throw Invalid("presentation context item shorter than 4 bytes");
        byte id = v.Span[0];
        string? abstractSyntax = null;
        var ts = new List<string>();
        foreach (var (type, value) in Items(v[4..], "presentation context item"))
        {
            if (type == ItemAbstractSyntax && abstractSyntax is null) abstractSyntax = Uid(value.Span);
            else if (type == ItemTransferSyntax) ts.Add(Uid(value.Span));
        }
        if (abstractSyntax is null || ts.Count == 0) throw Invalid($"presentation context {id} lacks its abstract syntax or transfer syntaxes");
        return new PresentationContextProposal(id, abstractSyntax, ts);
    }

    private static PresentationContextAnswer DecodeAnswer(ReadOnlyMemory<byte> v)
    {
        if (v.Length < 4) throw Invalid("presentation context item shorter than 4 bytes");
        string ts = "";
        foreach (var (type, value) in Items(v[4..], "presentation context item"))
            if (type == ItemTransferSyntax) ts = Uid(value.Span);
        return new PresentationContextAnswer(v.Span[0], (PresentationContextResult)v.Span[2], ts);
    }

    private static UserInformation DecodeUser(ReadOnlyMemory<byte> v)
    {
        uint max = 0;
        string? cls = null, version = null;
        var others = new List<PduItem>();
        foreach (var (type, value) in Items(v, "user information item"))
        {
            switch (type)
            {
                case SubItemMaxLength when value.Length == 4: max = BinaryPrimitives.ReadUInt32BigEndian(value.Span); break;
                case SubItemMaxLength: throw Invalid($"maximum length sub-item has length {value.Length}, expected 4");
                case SubItemImplementationClass: cls = Uid(value.Span); break;
                case SubItemImplementationVersion: version = Encoding.ASCII.GetString(value.Span).Trim(); break;
                default: others.Add(new PduItem(type, value.ToArray())); break;
            }
        }
        return new UserInformation(max, cls, version, others);
    }

    private static IEnumerable<(byte Type, ReadOnlyMemory<byte> Value)> Items(ReadOnlyMemory<byte> data, string where)
    {
        int pos = 0;
        while (pos < data.Length)
        {
            if (data.Length - pos < 4) throw Invalid($"{where} ends inside an item header");
            byte type = data.Span[pos];
            int len = BinaryPrimitives.ReadUInt16BigEndian(data.Span[(pos + 2)..]);
            if (len > data.Length - pos - 4) throw Invalid($"{where}: item 0x{type:X2} of length {len} overruns its container");
            yield return (type, data.Slice(pos + 4, len));
            pos += 4 + len;
        }
    }

    private static string AeText(ReadOnlySpan<byte> b) => Encoding.ASCII.GetString(b).Trim(' ', '\0');

    private static string Uid(ReadOnlySpan<byte> b) => Encoding.ASCII.GetString(b).TrimEnd('\0', ' ');

    private static DicomProtocolException Invalid(string message) => new(message, AbortReason.InvalidPduParameterValue);

    /// <summary>A growable big-endian byte buffer.</summary>
    private sealed class BigEndianWriter
    {
        private byte[] _buf = new byte[256];

        public int Length { get; private set; }

        private Span<byte> Take(int n)
        {
            if (Length + n > _buf.Length) Array.Resize(ref _buf, Math.Max(_buf.Length * 2, Length + n));
            var span = _buf.AsSpan(Length, n);
            Length += n;
            return span;
        }

        public void U8(byte v) => Take(1)[0] = v;
        public void U16(ushort v) => BinaryPrimitives.WriteUInt16BigEndian(Take(2), v);
        public void U32(uint v) => BinaryPrimitives.WriteUInt32BigEndian(Take(4), v);
        public void Bytes(ReadOnlySpan<byte> b) => b.CopyTo(Take(b.Length));
        public void Ascii(string s) => Encoding.ASCII.GetBytes(s, Take(Encoding.ASCII.GetByteCount(s)));
        public int Reserve(int n) { Take(n); return Length - n; }
        public void PatchU16(int at, ushort v) => BinaryPrimitives.WriteUInt16BigEndian(_buf.AsSpan(at), v);
        public void PatchU32(int at, uint v) => BinaryPrimitives.WriteUInt32BigEndian(_buf.AsSpan(at), v);
        public byte[] ToArray() => _buf.AsSpan(0, Length).ToArray();
    }
}
