using System.Net;
using System.Net.Sockets;
using System.Text.RegularExpressions;
using Serimetry.Api.Storage;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Network;

namespace Serimetry.Api.Tests;

/// <summary>
/// The DICOM receiver of <c>serimetry serve --dicom-port</c> against real DICOM peers: dcmtk's echoscu and storescu
/// (Debian's dcmtk), dcmtk's compressors (dcmcjpeg, dcmcrle, dcmcjpls) and raw malformed traffic.
/// </summary>
public sealed class DicomReceiverTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    private static async Task<(ServiceProcess Service, int Port)> Start(string data, params string[] extra)
    {
        int port = DicomTools.FreePort();
        var service = await ServiceProcess.Start(data, ["--dicom-port", port.ToString(System.Globalization.CultureInfo.InvariantCulture), .. extra]);
        return (service, port);
    }

    private static string Echo(int port, string calledAe = "SERIMETRY") =>
        DicomTools.Ok("echoscu", "-aec", calledAe, "127.0.0.1", port.ToString(System.Globalization.CultureInfo.InvariantCulture));

    /// <summary>Waits until the service log has <paramref name="count"/> matches of <paramref name="pattern"/>; returns them.</summary>
    private static async Task<List<Match>> WaitLog(ServiceProcess s, string pattern, int count = 1)
    {
        for (int i = 0; i < 1200; i++)
        {
            var m = Regex.Matches(s.Log, pattern).ToList();
            if (m.Count >= count) return m;
            await Task.Delay(50);
        }
        throw new TimeoutException($"log never matched '{pattern}' {count} times:\n{s.Log}");
    }

    [Fact]
    public async Task Storescu_study_is_stored_byte_for_byte_indexed_with_roles_and_triggers_a_comparison()
    {
        string key = ServiceProcess.CreateKey(_data, "dicom-test");
        var (service, port) = await Start(_data);
        using var _ = service;
        using var api = new ApiClient(service.BaseUrl, key);
        string p = port.ToString(System.Globalization.CultureInfo.InvariantCulture);

        // Src: dcmtk echoscu, a real Verification SCU: exit code 0 means C-ECHO-RSP status Success (PS3.4 A.4).
        Echo(port);
        var sent = DicomTools.VisitFiles(0);
        DicomTools.Ok("storescu", "-aec", "SERIMETRY", "+sd", "+r", "127.0.0.1", p, DicomTools.VisitDicom(0));
        var indexed = await WaitLog(service, @"study (\w+) indexed from DICOM \((\d+) instances\)");
        string baseline = indexed[0].Groups[1].Value;
        Assert.Equal(sent.Length.ToString(System.Globalization.CultureInfo.InvariantCulture), indexed[0].Groups[2].Value);

        // Once indexed, received/ keeps no copy of the instances: the study folder (and the blob store) hold them.
        Assert.Empty(Directory.GetFiles(Path.Combine(_data, "received"), "*.dcm", SearchOption.AllDirectories));
        // Every instance stored: the data set bytes after the File Meta equal those of the file storescu read (dcmtk
        // sends the data set unchanged when the transfer syntax is kept).
        var stored = Directory.GetFiles(Path.Combine(_data, "studies", baseline), "*.dcm")
            .ToDictionary(f => Path.GetFileNameWithoutExtension(f));
        Assert.Equal(sent.Length, stored.Count);
        foreach (var f in sent)
            Assert.Equal(DicomTools.DatasetBytes(f), DicomTools.DatasetBytes(stored[DicomTools.SopInstanceUid(f)]));
        // Src: dcmtk's dcmdump reads our File Meta: transfer syntax and media storage UIDs of the command.
        var one = stored[DicomTools.SopInstanceUid(sent[0])];
        Assert.Equal("1.2.840.10008.1.2.1", DicomTools.Dcmdump(one, "0002,0010"));
        Assert.Equal(DicomTools.Dcmdump(sent[0], "0008,0018"), DicomTools.Dcmdump(one, "0002,0003"));

        // Indexed exactly as an upload: the study lists the three series with their roles, patient from the headers.
        var study = await api.Expect(HttpStatusCode.OK, HttpMethod.Get, $"/v1/studies/{baseline}");
        Assert.Equal(DicomTools.Dcmdump(sent[0], "0010,0020"), (string?)study["patientId"]);
        Assert.Equal(["adc", "dwi", "t2w"], study["series"]!.AsArray().Select(s => (string)s!["role"]!).Order().ToArray());

        // Trigger rule. The follow-up visit arrives while no baseline mask is on file: nothing is queued.
        DicomTools.Ok("storescu", "-aec", "SERIMETRY", "+sd", "+r", "127.0.0.1", p, DicomTools.VisitDicom(1));
        await WaitLog(service, $"has an earlier study {baseline} on file but no gland mask");
        // With the baseline's gland mask on file, the follow-up sent again (same files, same study) queues one comparison, which runs.
        await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={baseline}&role=gland",
            ApiClient.Bytes(File.ReadAllBytes(DicomTools.VisitMask(0, "gland")), "application/octet-stream"));
        DicomTools.Ok("storescu", "-aec", "SERIMETRY", "+sd", "+r", "127.0.0.1", p, DicomTools.VisitDicom(1));
        var queued = await WaitLog(service, @"comparison (\w+) queued by the DICOM rule: baseline study (\w+), 1 follow-up");
        Assert.Equal(baseline, queued[0].Groups[2].Value);
        var result = await api.WaitFinished(queued[0].Groups[1].Value);
        Assert.Equal("done", (string?)result["state"]);

        // Sent a third time: indexed again as the same study, no second comparison.
        DicomTools.Ok("storescu", "-aec", "SERIMETRY", "+sd", "+r", "127.0.0.1", p, DicomTools.VisitDicom(1));
        var again = await WaitLog(service, @"study (\w+) indexed from DICOM", 4);
        Assert.Single(again.Skip(1).Select(m => m.Groups[1].Value).Distinct());
        Assert.Single(Regex.Matches(service.Log, "queued by the DICOM rule"));

        service.Kill();
        // Audit: each association with the calling AE title and the instance count.
        using var store = MetadataStore.Sqlite(Path.Combine(_data, "serimetry.db"));
        var audit = store.AuditLog();
        Assert.Contains(audit, a => a.KeyName == "dicom:STORESCU" && a.Action == "dicom-association" && a.Resource.Contains($"{sent.Length} instances stored"));
        Assert.Contains(audit, a => a.KeyName == "dicom-rule" && a.Action == "submit-comparison");
        // No PHI in the log: Patient ID and Patient's Name as dcmdump reads them.
        foreach (var tag in new[] { "0010,0020", "0010,0010" })
        {
            string phi = DicomTools.Dcmdump(sent[0], tag);
            Assert.NotEmpty(phi);
            Assert.DoesNotContain(phi, service.Log);
        }
    }

    [Fact]
    public async Task Compressed_and_deflated_transfers_are_stored_in_the_negotiated_syntax()
    {
        var (service, port) = await Start(_data);
        using var _ = service;
        string p = port.ToString(System.Globalization.CultureInfo.InvariantCulture);
        string work = Path.Combine(_data, "sent");
        Directory.CreateDirectory(work);
        var source = DicomTools.VisitFiles(0).Where(f => f.Contains("t2w", StringComparison.Ordinal)).Take(4).ToArray();
        // (compressor, storescu proposal, transfer syntax UID from PS3.6 annex A)
        var cases = new[]
        {
            ("dcmcjpeg", "-xs", "1.2.840.10008.1.2.4.70"), // JPEG Lossless, first-order prediction (dcmcjpeg's default)
            ("dcmcrle", "-xr", "1.2.840.10008.1.2.5"), // RLE Lossless
            ("dcmcjpls", "-xt", "1.2.840.10008.1.2.4.80"), // JPEG-LS Lossless (dcmcjpls's default)
            ("", "-xd", "1.2.840.10008.1.2.1.99"), // Deflated Explicit VR Little Endian, deflated by storescu on the fly
        };
        for (int i = 0; i < cases.Length; i++)
        {
            var (tool, proposal, uid) = cases[i];
            string file = source[i];
            if (tool.Length > 0)
            {
                file = Path.Combine(work, $"{tool}.dcm");
                DicomTools.Ok(tool, source[i], file);
                Assert.Equal(uid, DicomTools.Dcmdump(file, "0002,0010"));
            }
            DicomTools.Ok("storescu", "-aec", "SERIMETRY", proposal, "127.0.0.1", p, file);
            var indexed = await WaitLog(service, @"study (\w+) indexed from DICOM \((\d+) instances\)", i + 1);
            // One instance per association, all of one study: each index holds every instance received so far, also
            // after the earlier ones left received/.
            Assert.Equal((i + 1).ToString(System.Globalization.CultureInfo.InvariantCulture), indexed[i].Groups[2].Value);
            Assert.Empty(Directory.GetFiles(Path.Combine(_data, "received"), "*.dcm", SearchOption.AllDirectories));
            string stored = Path.Combine(_data, "studies", indexed[i].Groups[1].Value, DicomTools.SopInstanceUid(file) + ".dcm");
            // Src: dcmtk's dcmdump reads the transfer syntax we recorded in the File Meta.
            Assert.Equal(uid, DicomTools.Dcmdump(stored, "0002,0010"));
            if (tool.Length > 0) Assert.Equal(DicomTools.DatasetBytes(file), DicomTools.DatasetBytes(stored));
            // Lossless: the stored pixels decode to the values of the uncompressed original.
            Assert.Equal(DicomFile.Read(source[i]).GetPixelData().GetStoredValues(0), DicomFile.Read(stored).GetPixelData().GetStoredValues(0));
        }
    }

    [Fact]
    public async Task Wrong_title_garbage_and_oversized_pdus_are_refused_cleanly_and_the_service_stays_up()
    {
        var (service, port) = await Start(_data, "--dicom-calling-aes", "ECHOSCU,STORESCU");
        using var _ = service;

        // Src: dcmtk echoscu reports the A-ASSOCIATE-RJ reason (PS3.8 table 9-21: source 1, reason 7).
        var (exit, output) = DicomTools.Run("echoscu", "-aec", "NOT-US", "127.0.0.1", port.ToString(System.Globalization.CultureInfo.InvariantCulture));
        Assert.NotEqual(0, exit);
        Assert.Contains("Called AE Title Not Recognized", output);
        (exit, output) = DicomTools.Run("echoscu", "-aet", "STRANGER", "-aec", "SERIMETRY", "127.0.0.1", port.ToString(System.Globalization.CultureInfo.InvariantCulture));
        Assert.NotEqual(0, exit);
        Assert.Contains("Calling AE Title Not Recognized", output);

        // Garbage: an unknown PDU type -> A-ABORT, provider source 2, reason 1 unrecognized PDU (PS3.8 table 9-26).
        Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 1 }, await RawExchange(port, "GET / HTTP/1.1\r\nHost: x\r\n\r\n"u8.ToArray()));
        // A PDU announcing 2 GiB (above the 1 MiB accepted) -> A-ABORT reason 6 before any body is read.
        Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 6 }, await RawExchange(port, [1, 0, 0x7F, 0xFF, 0xFF, 0xFF, 0, 1]));
        // A P-DATA-TF first (no association yet) -> A-ABORT reason 2 unexpected PDU.
        Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 2 }, await RawExchange(port, [4, 0, 0, 0, 0, 6, 0, 0, 0, 2, 1, 3]));
        // Inside an accepted association, an oversized P-DATA-TF -> A-ABORT reason 6.
        Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 6 }, await OversizedInsideAssociation(port));

        // Still serving: dcmtk echoscu succeeds.
        Echo(port);
        await WaitLog(service, "ended \\(Aborted\\)", 4);
        Assert.Contains("ended (Rejected): called AE title 'NOT-US'", service.Log);
    }

    [Fact]
    public async Task Store_statuses_follow_ps3_4_for_mismatched_and_unreadable_data_sets()
    {
        var (service, port) = await Start(_data);
        using var _ = service;
        string file = DicomTools.VisitFiles(0)[0];
        var data = DicomTools.DatasetBytes(file); // Explicit VR Little Endian, as the phantom writer stores it
        string sopClass = DicomTools.Dcmdump(file, "0008,0016"), sopInstance = DicomTools.Dcmdump(file, "0008,0018");

        using var c = new TcpClient();
        await c.ConnectAsync(IPAddress.Loopback, port);
        var s = c.GetStream();
        var rq = new AssociateRequestPdu("SERIMETRY", "STATUS-TEST", PduCodec.DicomApplicationContext,
            [new PresentationContextProposal(1, sopClass, [DicomTransferSyntax.ExplicitVRLittleEndian])], new UserInformation(16384, "1.2.3", null));
        await s.WriteAsync(PduCodec.Encode(rq));
        Assert.IsType<AssociateAcceptPdu>(await ReadPdu(s));

        // PS3.4 B.2.3 C-STORE statuses: 0000 success, A900 data set does not match SOP class, C000 cannot understand.
        Assert.Equal(DimseStatus.Success, await Store(s, sopClass, sopInstance, data, 1));
        Assert.Equal(DimseStatus.DataSetDoesNotMatchSopClass, await Store(s, sopClass, "1.2.3.999", data, 2)); // command names another instance
        Assert.Equal(DimseStatus.CannotUnderstand, await Store(s, sopClass, "1.2.3.998", [0x08, 0x00, 0x18, 0x00, 0x55, 0x49, 0xFF, 0x7F, 1, 2], 3)); // length overruns
        await s.WriteAsync(PduCodec.Encode(new ReleaseRequestPdu()));
        Assert.IsType<ReleaseResponsePdu>(await ReadPdu(s));
        c.Close();
        await WaitLog(service, @"STATUS-TEST .* ended \(Released\): 1 instances stored, 2 refused");
    }

    private static async Task<Pdu> ReadPdu(NetworkStream s)
    {
        var header = new byte[6];
        await s.ReadExactlyAsync(header);
        var body = new byte[System.Buffers.Binary.BinaryPrimitives.ReadUInt32BigEndian(header.AsSpan(2))];
        await s.ReadExactlyAsync(body);
        return PduCodec.Decode(header[0], body);
    }

    /// <summary>One C-STORE-RQ (command, then the data set in two fragments) and the status of its C-STORE-RSP.</summary>
    private static async Task<ushort> Store(NetworkStream s, string sopClass, string sopInstance, byte[] data, ushort messageId)
    {
        var cmd = new DimseCommand { CommandField = DimseCommand.CStoreRequest, MessageId = messageId, Priority = 0, DataSetType = 0,
            AffectedSopClassUid = sopClass, AffectedSopInstanceUid = sopInstance };
        int half = data.Length / 2;
        await s.WriteAsync(PduCodec.Encode(new PDataPdu([new Pdv(1, true, true, cmd.Encode())])));
        await s.WriteAsync(PduCodec.Encode(new PDataPdu([new Pdv(1, false, false, data.AsMemory(0, half))])));
        await s.WriteAsync(PduCodec.Encode(new PDataPdu([new Pdv(1, false, true, data.AsMemory(half))])));
        var rsp = DimseCommand.Decode(Assert.Single(Assert.IsType<PDataPdu>(await ReadPdu(s)).Values).Data);
        Assert.Equal(DimseCommand.CStoreResponse, rsp.CommandField);
        Assert.Equal(messageId, rsp.MessageIdBeingRespondedTo);
        return rsp.Status!.Value;
    }

    [Fact]
    public void Accepted_sop_class_uids_are_the_standards_storage_classes()
    {
        // Src: dcmtk's UID table (dcmdump prints the PS3.6 name of a known UID): every accepted UID is Verification
        // or a "...Storage" SOP class, so no typo slips into the negotiation list.
        string dir = Path.Combine(_data, "uids");
        Directory.CreateDirectory(dir);
        foreach (var uid in StorageSopClasses.Accepted)
        {
            string dump = Path.Combine(dir, "d.txt"), file = Path.Combine(dir, "d.dcm");
            File.WriteAllText(dump, $"(0008,0016) UI [{uid}]\n");
            DicomTools.Ok("dump2dcm", dump, file);
            string name = DicomTools.Ok("dcmdump", "-q", "+P", "0008,0016", file).Split(' ', StringSplitOptions.RemoveEmptyEntries)[2];
            Assert.True(name == "=VerificationSOPClass" || name.EndsWith("Storage", StringComparison.Ordinal), $"{uid}: dcmtk names it {name}");
        }
    }

    /// <summary>Sends bytes on a fresh connection and returns everything the receiver sends back until it closes.</summary>
    private static async Task<byte[]> RawExchange(int port, byte[] send, Func<NetworkStream, Task>? before = null)
    {
        using var c = new TcpClient();
        await c.ConnectAsync(IPAddress.Loopback, port);
        var s = c.GetStream();
        if (before is not null) await before(s);
        await s.WriteAsync(send);
        using var ms = new MemoryStream();
        await s.CopyToAsync(ms).WaitAsync(TimeSpan.FromSeconds(60));
        return ms.ToArray();
    }

    private static Task<byte[]> OversizedInsideAssociation(int port) =>
        RawExchange(port, [4, 0, 0x10, 0, 0, 0], async s =>
        {
            var rq = new AssociateRequestPdu("SERIMETRY", "ECHOSCU", PduCodec.DicomApplicationContext,
                [new PresentationContextProposal(1, StorageSopClasses.Verification, [DicomTransferSyntax.ImplicitVRLittleEndian])],
                new UserInformation(16384, "1.2.3", null));
            await s.WriteAsync(PduCodec.Encode(rq));
            var header = new byte[6];
            await s.ReadExactlyAsync(header);
            Assert.Equal((byte)PduType.AssociateAccept, header[0]);
            await s.ReadExactlyAsync(new byte[System.Buffers.Binary.BinaryPrimitives.ReadUInt32BigEndian(header.AsSpan(2))]);
        });
}
