using Xunit;
using System.Buffers.Binary;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Network;

namespace Serimetry.Tests.Io.Dicom.Network;

/// <summary>PDU encode/decode round trips and byte layouts of PS3.8 section 9.3.</summary>
public sealed class PduCodecTests
{
    private static Pdu RoundTrip(Pdu pdu)
    {
        var bytes = PduCodec.Encode(pdu);
        // PS3.8 9.3.1: byte 0 type, byte 1 reserved, bytes 2-5 the big-endian length of the rest.
        Assert.Equal((byte)pdu.Type, bytes[0]);
        Assert.Equal((uint)(bytes.Length - 6), BinaryPrimitives.ReadUInt32BigEndian(bytes.AsSpan(2)));
        return PduCodec.Decode(bytes[0], bytes.AsMemory(6));
    }

    private static AssociateRequestPdu Request() => new("SERIMETRY", "MODALITY1", PduCodec.DicomApplicationContext,
        [
            new PresentationContextProposal(1, StorageSopClasses.Verification, [DicomTransferSyntax.ImplicitVRLittleEndian]),
            new PresentationContextProposal(3, StorageSopClasses.MrImage, ["1.2.840.10008.1.2.4.70", DicomTransferSyntax.ExplicitVRLittleEndian]),
        ],
        new UserInformation(16384, "1.2.3.4", "TESTER_1", [new PduItem(0x53, [0, 1, 0, 1])]));

    [Fact]
    public void Associate_request_round_trips_with_its_fixed_field_layout()
    {
        var rq = Request();
        var bytes = PduCodec.Encode(rq);
        // PS3.8 table 9-11: protocol version at bytes 7-8, called AE at 11-26, calling AE at 27-42 (1-based), space padded.
        Assert.Equal(1, BinaryPrimitives.ReadUInt16BigEndian(bytes.AsSpan(6)));
        Assert.Equal("SERIMETRY       "u8.ToArray(), bytes[10..26]);
        Assert.Equal("MODALITY1       "u8.ToArray(), bytes[26..42]);
        // The first item follows the 32 reserved bytes at offset 74: application context item type 0x10.
        Assert.Equal(0x10, bytes[74]);
        var back = Assert.IsType<AssociateRequestPdu>(RoundTrip(rq));
        Assert.Equal(rq.CalledAe, back.CalledAe);
        Assert.Equal(rq.CallingAe, back.CallingAe);
        Assert.Equal(rq.ApplicationContext, back.ApplicationContext);
        Assert.Equal(2, back.Contexts.Count);
        Assert.Equal(rq.Contexts[1].TransferSyntaxes, back.Contexts[1].TransferSyntaxes);
        Assert.Equal(16384u, back.User.MaxPduLength);
        Assert.Equal("1.2.3.4", back.User.ImplementationClassUid);
        Assert.Equal("TESTER_1", back.User.ImplementationVersionName);
        Assert.Equal(new byte[] { 0, 1, 0, 1 }, Assert.Single(back.User.Others).Value);
    }

    [Fact]
    public void Accept_reject_release_abort_and_data_round_trip()
    {
        var ac = new AssociateAcceptPdu("SERIMETRY", "MODALITY1", PduCodec.DicomApplicationContext,
            [new PresentationContextAnswer(1, PresentationContextResult.Acceptance, DicomTransferSyntax.ImplicitVRLittleEndian),
             new PresentationContextAnswer(3, PresentationContextResult.AbstractSyntaxNotSupported, DicomTransferSyntax.ImplicitVRLittleEndian)],
            new UserInformation(1 << 20, "1.2.3", null));
        var acBack = Assert.IsType<AssociateAcceptPdu>(RoundTrip(ac));
        Assert.Equal(ac.Contexts, acBack.Contexts);
        Assert.Equal(1u << 20, acBack.User.MaxPduLength);

        Assert.Equal(AssociateRejectPdu.CalledAeNotRecognized, RoundTrip(AssociateRejectPdu.CalledAeNotRecognized));
        Assert.IsType<ReleaseRequestPdu>(RoundTrip(new ReleaseRequestPdu()));
        Assert.IsType<ReleaseResponsePdu>(RoundTrip(new ReleaseResponsePdu()));
        Assert.Equal(new AbortPdu(2, 6), RoundTrip(new AbortPdu(2, 6)));

        var pd = new PDataPdu([new Pdv(1, true, false, new byte[] { 1, 2, 3 }), new Pdv(1, true, true, new byte[] { 4 }), new Pdv(3, false, true, new byte[10])]);
        var back = Assert.IsType<PDataPdu>(RoundTrip(pd));
        Assert.Equal(3, back.Values.Count);
        Assert.Equal(pd.Values.Select(v => (v.ContextId, v.IsCommand, v.IsLast, v.Data.ToArray().Length)),
            back.Values.Select(v => (v.ContextId, v.IsCommand, v.IsLast, v.Data.ToArray().Length)));
        Assert.Equal(new byte[] { 1, 2, 3 }, back.Values[0].Data.ToArray());
    }

    [Fact]
    public void Fixed_layouts_match_the_standard_byte_for_byte()
    {
        // PS3.8 9.3.4 (A-ASSOCIATE-RJ): 03 00 | 00 00 00 04 | reserved, result, source, reason.
        Assert.Equal(new byte[] { 3, 0, 0, 0, 0, 4, 0, 1, 1, 7 }, PduCodec.Encode(AssociateRejectPdu.CalledAeNotRecognized));
        // PS3.8 9.3.6 (A-RELEASE-RQ): 05 00 | 00 00 00 04 | 4 reserved bytes.
        Assert.Equal(new byte[] { 5, 0, 0, 0, 0, 4, 0, 0, 0, 0 }, PduCodec.Encode(new ReleaseRequestPdu()));
        // PS3.8 9.3.8 (A-ABORT): 07 00 | 00 00 00 04 | reserved, reserved, source, reason.
        Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 1 }, PduCodec.Encode(new AbortPdu(2, 1)));
        // PS3.8 9.3.5 and annex E.2: PDV item length (4, big endian, counts context id + header + data), context id,
        // message control header bit 0 command, bit 1 last fragment.
        Assert.Equal(new byte[] { 4, 0, 0, 0, 0, 7, 0, 0, 0, 3, 5, 3, 0xAB }, PduCodec.Encode(new PDataPdu([new Pdv(5, true, true, new byte[] { 0xAB })])));
    }

    [Theory]
    [InlineData(new byte[] { 0, 0, 0, 9, 1, 3, 0 })] // PDV length 9 overruns the PDU
    [InlineData(new byte[] { 0, 0, 0, 1, 1 })] // PDV length below 2
    [InlineData(new byte[] { 0, 0, 0, 2, 1, 0x10 })] // reserved bits of the message control header set
    [InlineData(new byte[] { })] // no PDV at all
    public void Malformed_pdata_is_a_protocol_error(byte[] body)
    {
        var e = Assert.Throws<DicomProtocolException>(() => PduCodec.Decode((byte)PduType.PData, body));
        Assert.Equal(AbortReason.InvalidPduParameterValue, e.AbortReason);
    }

    [Fact]
    public void Truncated_or_unknown_pdus_are_protocol_errors()
    {
        var rq = PduCodec.Encode(Request());
        // Cut anywhere: the fixed part is short, an item overruns, or a required item is missing; never an unchecked slice.
        for (int cut = 0; cut < rq.Length - 6; cut += 5)
            Assert.Throws<DicomProtocolException>(() => PduCodec.Decode(1, rq.AsMemory(6, cut)));
        Assert.Equal(AbortReason.UnrecognizedPdu, Assert.Throws<DicomProtocolException>(() => PduCodec.Decode(0x47, new byte[4])).AbortReason);
        Assert.Throws<DicomProtocolException>(() => PduCodec.Decode((byte)PduType.Abort, new byte[3]));
    }
}
