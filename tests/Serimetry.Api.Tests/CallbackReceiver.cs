using System.Net;
using System.Net.Sockets;

namespace Serimetry.Api.Tests;

/// <summary>A loopback HTTP endpoint that records callback bodies, refusing the first <c>failFirst</c> with 503.</summary>
internal sealed class CallbackReceiver : IDisposable
{
    private readonly HttpListener _listener = new();
    private readonly List<string> _bodies = [];
    private int _remainingFailures;

    public CallbackReceiver(int failFirst)
    {
        _remainingFailures = failFirst;
        using var probe = new TcpListener(IPAddress.Loopback, 0);
        probe.Start();
        int port = ((IPEndPoint)probe.LocalEndpoint).Port;
        probe.Stop();
        Url = $"http://127.0.0.1:{port}/callback/";
        _listener.Prefixes.Add(Url);
        _listener.Start();
        _ = Task.Run(Loop);
    }

    public string Url { get; }

    private async Task Loop()
    {
        while (_listener.IsListening)
        {
            HttpListenerContext ctx;
            try { ctx = await _listener.GetContextAsync(); }
            catch (Exception e) when (e is HttpListenerException or ObjectDisposedException) { return; }
            using var reader = new StreamReader(ctx.Request.InputStream);
            string body = await reader.ReadToEndAsync();
            lock (_bodies) _bodies.Add(body);
            ctx.Response.StatusCode = Interlocked.Decrement(ref _remainingFailures) >= 0 ? 503 : 200;
            ctx.Response.Close();
        }
    }

    /// <summary>Waits (bounded) until <paramref name="count"/> deliveries arrived and returns them.</summary>
    public async Task<IReadOnlyList<string>> WaitFor(int count)
    {
        for (int i = 0; i < 600; i++)
        {
            lock (_bodies) if (_bodies.Count >= count) return [.. _bodies];
            await Task.Delay(100);
        }
        lock (_bodies) throw new TimeoutException($"{_bodies.Count} of {count} callbacks arrived");
    }

    public void Dispose() => _listener.Close();
}
