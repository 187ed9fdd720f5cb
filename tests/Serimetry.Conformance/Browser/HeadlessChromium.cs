using System.Diagnostics;
using System.Net.WebSockets;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace Serimetry.Conformance.Browser;

/// <summary>What a page did when loaded in a real browser.</summary>
public sealed record PageCheck(IReadOnlyList<string> Errors, int Images, int BrokenImages, byte[] Screenshot);

/// <summary>
/// Loads a page in Debian's headless Chromium and reads, over the Chrome DevTools Protocol (its public
/// WebSocket interface), the console and network errors, whether every image decoded, and a screenshot.
/// </summary>
public static class HeadlessChromium
{
    public const string Executable = "/usr/bin/chromium";

    public static PageCheck Load(string path, TimeSpan timeout)
    {
        var profile = Directory.CreateTempSubdirectory("serimetry-chromium-");
        using var process = Process.Start(new ProcessStartInfo(Executable,
        [
            "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
            "--disable-component-update", "--disable-sync", "--remote-debugging-port=0", "--window-size=1200,2400",
            $"--user-data-dir={profile.FullName}", "about:blank",
        ])
        { RedirectStandardError = true, RedirectStandardOutput = true })!;
        try
        {
            using var cts = new CancellationTokenSource(timeout);
            var endpoint = BrowserEndpoint(process, cts.Token);
            return Inspect(endpoint, new Uri(Path.GetFullPath(path)).AbsoluteUri, cts.Token).GetAwaiter().GetResult();
        }
        finally
        {
            if (!process.HasExited) process.Kill(entireProcessTree: true);
            process.WaitForExit(5000);
            try { profile.Delete(recursive: true); } catch (IOException) { /* Chromium may still hold a lock file; the temp folder is disposable. */ }
        }
    }

    private static Uri BrowserEndpoint(Process process, CancellationToken ct)
    {
        while (!ct.IsCancellationRequested)
        {
            var line = process.StandardError.ReadLine() ?? throw new InvalidOperationException("Chromium exited before offering DevTools");
            const string marker = "DevTools listening on ";
            int at = line.IndexOf(marker, StringComparison.Ordinal);
            if (at >= 0) return new Uri(line[(at + marker.Length)..].Trim());
        }
        throw new TimeoutException("Chromium did not offer DevTools in time");
    }

    private static async Task<PageCheck> Inspect(Uri browser, string url, CancellationToken ct)
    {
        using var http = new HttpClient();
        var list = JsonNode.Parse(await http.GetStringAsync($"http://{browser.Authority}/json/list", ct))!.AsArray();
        var page = list.First(t => (string?)t!["type"] == "page")!;
        using var ws = new ClientWebSocket();
        await ws.ConnectAsync(new Uri((string)page["webSocketDebuggerUrl"]!), ct);
        var errors = new List<string>();
        int id = 0;
        async Task<JsonNode> Call(string method, object? parameters = null)
        {
            int myId = ++id;
            var msg = JsonSerializer.Serialize(new { id = myId, method, @params = parameters ?? new { } });
            await ws.SendAsync(Encoding.UTF8.GetBytes(msg), WebSocketMessageType.Text, true, ct);
            while (true)
            {
                var node = await Receive(ws, ct);
                if ((int?)node["id"] == myId) return node["result"] ?? new JsonObject();
                Collect(node, errors);
            }
        }
        await Call("Log.enable");
        await Call("Runtime.enable");
        await Call("Page.enable");
        await Call("Page.navigate", new { url });
        while (true)
        {
            var node = await Receive(ws, ct);
            if ((string?)node["method"] == "Page.loadEventFired") break;
            Collect(node, errors);
        }
        var images = await Call("Runtime.evaluate", new
        {
            expression = "JSON.stringify([document.images.length, Array.from(document.images).filter(i => !i.complete || i.naturalWidth === 0).length])",
            returnByValue = true,
        });
        var counts = JsonNode.Parse((string)images["result"]!["value"]!)!.AsArray();
        var shot = await Call("Page.captureScreenshot", new { format = "png", captureBeyondViewport = true });
        return new PageCheck(errors, (int)counts[0]!, (int)counts[1]!, Convert.FromBase64String((string)shot["data"]!));
    }

    private static void Collect(JsonNode node, List<string> errors)
    {
        switch ((string?)node["method"])
        {
            case "Log.entryAdded" when (string?)node["params"]!["entry"]!["level"] == "error":
                errors.Add((string)node["params"]!["entry"]!["text"]!);
                break;
            case "Runtime.consoleAPICalled" when (string?)node["params"]!["type"] == "error":
                errors.Add("console.error: " + node["params"]!["args"]!.ToJsonString());
                break;
            case "Runtime.exceptionThrown":
                errors.Add("exception: " + node["params"]!["exceptionDetails"]!.ToJsonString());
                break;
        }
    }

    private static async Task<JsonNode> Receive(ClientWebSocket ws, CancellationToken ct)
    {
        var buffer = new byte[1 << 16];
        using var ms = new MemoryStream();
        WebSocketReceiveResult r;
        do
        {
            r = await ws.ReceiveAsync(buffer, ct);
            ms.Write(buffer, 0, r.Count);
        }
        while (!r.EndOfMessage);
        return JsonNode.Parse(ms.ToArray())!;
    }
}
