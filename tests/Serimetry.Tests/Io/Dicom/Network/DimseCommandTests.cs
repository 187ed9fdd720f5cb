using Xunit;
using System.Buffers.Binary;
using Serimetry.Engine.Io.Dicom.Network;

namespace Serimetry.Tests.Io.Dicom.Network;

/// <summary>DIMSE command sets (PS3.7 section 9.3, annex E) and association negotiation (PS3.8 9.3.2-9.3.4).</summary>
public sealed class DimseCommandTests
{
    [Fact]
    public void Store_request_round_trips_and_its_response_answers_it()
    {
        var rq = new DimseCommand
        {
            CommandField = DimseCommand.CStoreRequest, MessageId = 7, Priority = 0, DataSetType = 0x0000,
            AffectedSopClassUid = StorageSopClasses.MrImage, AffectedSopInstanceUid = "1.2.3.44",
            MoveOriginatorAe = "PACS", MoveOriginatorMessageId = 3,
        };
        var back = DimseCommand.Decode(rq.Encode());
        Assert.Equal(rq, back);
        Assert.True(back.HasDataSet);

        var rsp = back.Response(DimseStatus.DataSetDoesNotMatchSopClass, "mismatch");
        var rspBack = DimseCommand.Decode(rsp.Encode());
        // PS3.7 9.3.1.2 (C-STORE-RSP): command field 8001H, Message ID Being Responded To, no data set (0101H).
        Assert.Equal(0x8001, rspBack.CommandField);
        Assert.Equal((ushort)7, rspBack.MessageIdBeingRespondedTo);
        Assert.Equal((ushort)0xA900, rspBack.Status);
        Assert.Equal(DimseCommand.NoDataSet, rspBack.DataSetType);
        Assert.Equal("1.2.3.44", rspBack.AffectedSopInstanceUid);
        Assert.Equal("mismatch", rspBack.ErrorComment);
    }

    [Fact]
    public void Command_set_starts_with_its_group_length_in_implicit_vr()
    {
        var bytes = new DimseCommand { CommandField = DimseCommand.CEchoResponse, MessageIdBeingRespondedTo = 1, Status = 0,
            AffectedSopClassUid = StorageSopClasses.Verification }.Encode();
        // PS3.7 E.1 / PS3.5 7.1.3: (0000,0000) UL, 4-byte length, value = bytes after this element; even-length UID padded with NUL.
        Assert.Equal(0u, BinaryPrimitives.ReadUInt32LittleEndian(bytes));
        Assert.Equal(4u, BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(4)));
        Assert.Equal((uint)(bytes.Length - 12), BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(8)));
        Assert.Equal(0, (bytes.Length - 12) % 2);
    }

    [Fact]
    public void Malformed_command_sets_are_protocol_errors()
    {
        Assert.Throws<DicomProtocolException>(() => DimseCommand.Decode(new byte[] { 0, 0, 0, 1, 0xFF, 0, 0, 0 })); // length overruns
        var noField = new byte[] { 0, 0, 0x10, 0, 2, 0, 0, 0, 1, 0 }; // only Message ID
        Assert.Throws<DicomProtocolException>(() => DimseCommand.Decode(noField));
        var otherGroup = new byte[] { 8, 0, 0x18, 0, 2, 0, 0, 0, 0x31, 0 }; // (0008,0018) in a command
        Assert.Throws<DicomProtocolException>(() => DimseCommand.Decode(otherGroup));
    }

    private static AssociateRequestPdu Rq(string called = "SERIMETRY", string calling = "MOD", ushort version = 1, string? app = null,
        params PresentationContextProposal[] pcs) =>
        new(called, calling, app ?? PduCodec.DicomApplicationContext, pcs, new UserInformation(16384, "1.2", null), version);

    [Fact]
    public void Negotiation_accepts_known_contexts_in_the_requesters_order_and_rejects_per_context()
    {
        var options = new StorageScpOptions();
        var (answer, refusal) = AssociationNegotiator.Answer(Rq(pcs:
        [
            new(1, StorageSopClasses.MrImage, ["1.2.840.10008.1.2.4.70", "1.2.840.10008.1.2.1"]), // JPEG lossless SV1 first: kept
            new(3, StorageSopClasses.MrImage, ["1.2.840.10008.1.2.4.50", "1.2.840.10008.1.2"]), // JPEG baseline (lossy) skipped
            new(5, StorageSopClasses.EnhancedMrImage, ["1.2.840.10008.1.2.4.91"]), // JPEG 2000 only: no decoder
            new(7, "1.2.840.10008.5.1.4.1.1.481.1", ["1.2.840.10008.1.2"]), // RT Image Storage: not a class we take
            new(9, StorageSopClasses.Segmentation, ["1.2.840.10008.1.2.5"]), // RLE
            new(11, StorageSopClasses.RtStructureSet, ["1.2.840.10008.1.2.4.81", "1.2.840.10008.1.2.1.99"]), // JPEG-LS near-lossless refused, deflate taken
        ]), options);
        Assert.Null(refusal);
        var ac = Assert.IsType<AssociateAcceptPdu>(answer);
        // PS3.8 table 9-18 result codes: 0 acceptance, 3 abstract syntax not supported, 4 transfer syntaxes not supported.
        Assert.Equal([(1, 0, "1.2.840.10008.1.2.4.70"), (3, 0, "1.2.840.10008.1.2"), (5, 4, null), (7, 3, null), (9, 0, "1.2.840.10008.1.2.5"), (11, 0, "1.2.840.10008.1.2.1.99")],
            ac.Contexts.Select(c => ((int)c.Id, (int)c.Result, c.Result == 0 ? c.TransferSyntax : null)).ToArray());
        Assert.Equal(options.MaxPduLength, ac.User.MaxPduLength);
    }

    [Fact]
    public void Negotiation_rejects_wrong_titles_version_and_context()
    {
        var options = new StorageScpOptions { AllowedCallingAeTitles = ["MOD"] };
        // PS3.8 table 9-21: (result, source, reason).
        Assert.Equal(new AssociateRejectPdu(1, 1, 7), AssociationNegotiator.Answer(Rq(called: "OTHER"), options).Answer);
        Assert.Equal(new AssociateRejectPdu(1, 1, 3), AssociationNegotiator.Answer(Rq(calling: "STRANGER"), options).Answer);
        Assert.Equal(new AssociateRejectPdu(1, 2, 2), AssociationNegotiator.Answer(Rq(version: 2), options).Answer);
        Assert.Equal(new AssociateRejectPdu(1, 1, 2), AssociationNegotiator.Answer(Rq(app: "1.2.3"), options).Answer);
        Assert.IsType<AssociateAcceptPdu>(AssociationNegotiator.Answer(Rq(called: "OTHER"), options with { CheckCalledAeTitle = false }).Answer);
    }

    [Theory]
    [InlineData("SERIMETRY", true)]
    [InlineData("", false)]
    [InlineData("   ", false)]
    [InlineData("SEVENTEEN-CHARS-X", false)]
    [InlineData("A\\B", false)]
    public void Ae_titles_follow_ps3_5(string ae, bool valid) => Assert.Equal(valid, StorageScpOptions.IsValidAeTitle(ae));
}
