using System.Collections.Concurrent;
using System.Net;
using System.Net.Sockets;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// The storage SCP's TCP listener: one asynchronous <see cref="StorageScpSession"/> per connection, at most
/// <see cref="StorageScpOptions.MaxAssociations"/> served at once (more get A-ASSOCIATE-RJ, transient); connections
/// beyond twice that are closed at once. Every connection ends with <see cref="IStorageScpHandler.AssociationEndedAsync"/>.
/// </summary>
public sealed class StorageScpListener
{
    private readonly StorageScpOptions _options;
    private readonly IStorageScpHandler _handler;
    private readonly SemaphoreSlim _slots;
    private readonly ConcurrentDictionary<Task, byte> _running = new();
    private int _open;

    public StorageScpListener(StorageScpOptions options, IStorageScpHandler handler)
    {
        _options = options.Validate();
        _handler = handler;
        _slots = new SemaphoreSlim(options.MaxAssociations, options.MaxAssociations);
        Directory.CreateDirectory(options.ScratchDirectory);
    }

    /// <summary>Accepts connections on a started <paramref name="listener"/> until <paramref name="ct"/> is cancelled, then waits for open sessions.</summary>
    public async Task RunAsync(TcpListener listener, CancellationToken ct)
    {
        try
        {
            while (!ct.IsCancellationRequested)
            {
                var client = await listener.AcceptTcpClientAsync(ct);
                if (Interlocked.Increment(ref _open) > 2 * _options.MaxAssociations)
                {
                    Interlocked.Decrement(ref _open);
                    client.Dispose();
                    continue;
                }
                bool busy = !_slots.Wait(0);
                var task = Task.Run(() => Serve(client, busy, ct), CancellationToken.None);
                _running.TryAdd(task, 0);
                _ = task.ContinueWith(t => _running.TryRemove(t, out _), TaskScheduler.Default);
            }
        }
        catch (OperationCanceledException) when (ct.IsCancellationRequested) { }
        await Task.WhenAll(_running.Keys);
    }

    private async Task Serve(TcpClient client, bool busy, CancellationToken ct)
    {
        string peer = client.Client.RemoteEndPoint is IPEndPoint ep ? ep.ToString() : "unknown peer";
        AssociationSummary summary;
        try
        {
            client.NoDelay = true;
            // The stream belongs to the client, closed in finally only after the slot is free: a peer that saw the
            // close must find the slot free when it connects again.
            var stream = client.GetStream();
            summary = await new StorageScpSession(stream, _options, _handler, peer).RunAsync(busy, ct);
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            // A bug or a host failure while storing must not take the listener down: end this connection only.
            summary = new AssociationSummary(peer, null, null, AssociationEnd.Aborted, "receiver error " + e.GetType().Name, [], 0);
        }
        finally
        {
            if (!busy) _slots.Release();
            client.Dispose();
            Interlocked.Decrement(ref _open);
        }
        try
        {
            await _handler.AssociationEndedAsync(summary);
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            // The host logs its own failures; one failing study must not stop the listener for the next peer.
        }
    }
}
