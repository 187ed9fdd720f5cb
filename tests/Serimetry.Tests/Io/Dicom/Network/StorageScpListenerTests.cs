using System.Buffers.Binary;
using System.Net;
using System.Net.Sockets;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Network;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Network;

/// <summary>The listener's timers and association bound (PS3.8 9.1.5 ARTIM; table 9-21 transient rejection), in process on loopback.</summary>
public sealed class StorageScpListenerTests : IDisposable
{
    private readonly string _scratch = Path.Combine(Path.GetTempPath(), "serimetry-scp-" + Guid.NewGuid().ToString("N")[..8]);

    public void Dispose()
    {
        try { Directory.Delete(_scratch, recursive: true); }
        catch (IOException) { }
    }

    private sealed class Recorder : IStorageScpHandler
    {
        public List<AssociationSummary> Ended { get; } = [];
        public string DirectoryFor(string studyInstanceUid) => Path.GetTempPath();
        public Task AssociationEndedAsync(AssociationSummary summary) { lock (Ended) Ended.Add(summary); return Task.CompletedTask; }
    }

    private static AssociateRequestPdu Rq() => new("SERIMETRY", "UNIT", PduCodec.DicomApplicationContext,
        [new PresentationContextProposal(1, StorageSopClasses.Verification, [DicomTransferSyntax.ImplicitVRLittleEndian])],
        new UserInformation(16384, "1.2.3", null));

    private static async Task<byte[]> ReadPdu(NetworkStream s)
    {
        var header = new byte[6];
        await s.ReadExactlyAsync(header);
        var body = new byte[BinaryPrimitives.ReadUInt32BigEndian(header.AsSpan(2))];
        await s.ReadExactlyAsync(body);
        return [.. header, .. body];
    }

    [Fact]
    public async Task Silent_peer_is_aborted_by_the_artim_timer_and_extra_associations_are_rejected_transiently()
    {
        var options = new StorageScpOptions { ArtimTimeout = TimeSpan.FromMilliseconds(300), MaxAssociations = 1, ScratchDirectory = _scratch };
        var handler = new Recorder();
        var tcp = new TcpListener(IPAddress.Loopback, 0);
        tcp.Start();
        int port = ((IPEndPoint)tcp.LocalEndpoint).Port;
        using var stop = new CancellationTokenSource();
        var run = new StorageScpListener(options, handler).RunAsync(tcp, stop.Token);

        // A connection that sends nothing gets A-ABORT (provider, reason 0) when ARTIM expires, then is closed.
        using (var silent = new TcpClient())
        {
            await silent.ConnectAsync(IPAddress.Loopback, port);
            using var ms = new MemoryStream();
            await silent.GetStream().CopyToAsync(ms).WaitAsync(TimeSpan.FromSeconds(30));
            Assert.Equal(new byte[] { 7, 0, 0, 0, 0, 4, 0, 0, 2, 0 }, ms.ToArray());
        }

        // One association open (the bound is 1): a second request is rejected transient, source 3, reason 2 (local limit exceeded).
        using var first = new TcpClient();
        await first.ConnectAsync(IPAddress.Loopback, port);
        await first.GetStream().WriteAsync(PduCodec.Encode(Rq()));
        Assert.Equal((byte)PduType.AssociateAccept, (await ReadPdu(first.GetStream()))[0]);
        using (var second = new TcpClient())
        {
            await second.ConnectAsync(IPAddress.Loopback, port);
            await second.GetStream().WriteAsync(PduCodec.Encode(Rq()));
            Assert.Equal(new byte[] { 3, 0, 0, 0, 0, 4, 0, 2, 3, 2 }, await ReadPdu(second.GetStream()));
        }
        await first.GetStream().WriteAsync(PduCodec.Encode(new ReleaseRequestPdu()));
        Assert.Equal((byte)PduType.ReleaseResponse, (await ReadPdu(first.GetStream()))[0]);
        first.Close();

        stop.Cancel();
        tcp.Stop();
        await run.WaitAsync(TimeSpan.FromSeconds(30));
        lock (handler.Ended)
            Assert.Equal([AssociationEnd.Released, AssociationEnd.Rejected, AssociationEnd.TimedOut], handler.Ended.Select(e => e.End).Order().ToArray());
    }
}
