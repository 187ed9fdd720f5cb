using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;
using Xunit;

namespace Serimetry.Tests.Io.DicomWeb;

/// <summary>
/// The multipart/related reader against the grammar of RFC 2046 section 5.1.1 (delimiter = CRLF "--" boundary,
/// close delimiter = delimiter "--", preamble and epilogue ignored, transport padding allowed after a boundary)
/// and RFC 2387 (multipart/related).
/// </summary>
public sealed class MultipartRelatedReaderTests
{
    private static byte[] A(string s) => Encoding.Latin1.GetBytes(s);

    private static async Task<List<(MultipartPartHeaders Headers, byte[] Body)>> ReadAll(Stream s, string boundary, DicomWebLimits? limits = null)
    {
        var reader = new MultipartRelatedReader(s, boundary, limits);
        var parts = new List<(MultipartPartHeaders, byte[])>();
        while (true)
        {
            var ms = new MemoryStream();
            var h = await reader.ReadNextAsync(_ => ms);
            if (h is null) return parts;
            parts.Add((h, ms.ToArray()));
        }
    }

    private static byte[] Entity(string boundary, IReadOnlyList<byte[]> bodies, string preamble = "", string epilogue = "")
    {
        var ms = new MemoryStream();
        ms.Write(A(preamble));
        foreach (var b in bodies)
        {
            ms.Write(A((ms.Length == 0 ? "" : "\r\n") + "--" + boundary + "\r\nContent-Type: application/dicom\r\n\r\n"));
            ms.Write(b);
        }
        ms.Write(A("\r\n--" + boundary + "--" + epilogue));
        return ms.ToArray();
    }

    [Fact]
    public async Task PreambleAndEpilogueAreIgnored()
    {
        // Src: RFC 2046 5.1.1 - text before the first delimiter and after the close delimiter is to be ignored.
        var data = A("This preamble is ignored.\r\n--simple boundary\r\n\r\nfirst body, implicitly typed\r\n" +
                     "--simple boundary\r\nContent-type: text/plain; charset=us-ascii\r\n\r\nsecond body, explicitly typed.\r\n" +
                     "--simple boundary--\r\nThis epilogue is ignored too.");
        var parts = await ReadAll(new MemoryStream(data), "simple boundary");
        Assert.Equal(2, parts.Count);
        Assert.Equal("first body, implicitly typed", Encoding.ASCII.GetString(parts[0].Body));
        Assert.Null(parts[0].Headers.ContentType);
        Assert.Equal("second body, explicitly typed.", Encoding.ASCII.GetString(parts[1].Body));
        Assert.Equal("text/plain; charset=us-ascii", parts[1].Headers.ContentType); // header names are case-insensitive (RFC 2045 / RFC 5322)
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3, 7, 1)]
    [InlineData(13)]
    [InlineData(4096)]
    public async Task DelimitersSplitAcrossReadsAreFound(params int[] chunks)
    {
        // Bodies that contain near-misses of the delimiter: CRLF "--" followed by a boundary prefix, and the boundary without CRLF.
        string boundary = "b0undary-xyz";
        var bodies = new List<byte[]>
        {
            A("abc\r\n--b0undary-xy\r\nstill body --b0undary-xyz in line\r\n-"),
            Array.Empty<byte>(),
            Enumerable.Range(0, 70_000).Select(i => (byte)(i * 31 + 7)).ToArray(), // bigger than the 64 KiB buffer
            A("\r\n\r\n--"),
        };
        var parts = await ReadAll(new ChunkedStream(Entity(boundary, bodies), chunks), boundary);
        Assert.Equal(bodies.Count, parts.Count);
        for (int i = 0; i < bodies.Count; i++) Assert.Equal(bodies[i], parts[i].Body);
    }

    [Fact]
    public async Task RandomBodiesAndChunkingRoundTrip()
    {
        // Property: whatever the bytes (boundary-free by construction, as RFC 2046 5.1.1 requires) and the read sizes, the bodies come back exactly.
        var rng = new Random(5);
        for (int trial = 0; trial < 40; trial++)
        {
            string boundary = "r9" + rng.Next().ToString("x") + "=_";
            var bodies = Enumerable.Range(0, rng.Next(1, 6)).Select(_ =>
            {
                var b = new byte[rng.Next(0, 3000)];
                for (int i = 0; i < b.Length; i++) b[i] = (byte)"\r\n-ab=_r"[rng.Next(8)];
                return b;
            }).ToList();
            var data = Entity(boundary, bodies, trial % 2 == 0 ? "" : "preamble\r\n", trial % 3 == 0 ? "" : "\r\nepilogue");
            var parts = await ReadAll(new ChunkedStream(data, rng.Next(1, 50), rng.Next(1, 500)), boundary);
            Assert.Equal(bodies.Count, parts.Count);
            for (int i = 0; i < bodies.Count; i++) Assert.Equal(bodies[i], parts[i].Body);
        }
    }

    [Fact]
    public async Task TransportPaddingAfterTheBoundaryIsSkipped()
    {
        // Src: RFC 2046 5.1.1 - dash-boundary transport-padding CRLF, where transport-padding is linear white space.
        var data = A("--xx \t \r\nA: 1\r\n\r\nbody\r\n--xx--");
        var parts = await ReadAll(new MemoryStream(data), "xx");
        Assert.Equal("body", Encoding.ASCII.GetString(Assert.Single(parts).Body));
        Assert.Equal("1", parts[0].Headers.Fields["a"]);
    }

    [Fact]
    public async Task QuotedBoundaryFromTheContentTypeWorks()
    {
        // Src: RFC 2046 5.1.1 - boundaries with characters outside token (space, ':', '?') must be quoted in the header.
        var ct = MimeContentType.Parse("Multipart/Related; TYPE=\"application/dicom\"; boundary=\"a b:c?d\\\"e\"", "test");
        Assert.Equal("multipart/related", ct.MediaType);
        Assert.Equal("application/dicom", ct["type"]);
        string boundary = ct["boundary"]!;
        Assert.Equal("a b:c?d\"e", boundary);
        var parts = await ReadAll(new ChunkedStream(Entity(boundary, [A("x"), A("yz")]), 5), boundary);
        Assert.Equal(["x", "yz"], parts.Select(p => Encoding.ASCII.GetString(p.Body)));
    }

    [Fact]
    public async Task TruncatedBodyIsAFormatError()
    {
        var data = A("--xx\r\n\r\nbody without end");
        var e = await Assert.ThrowsAsync<InputFormatException>(() => ReadAll(new MemoryStream(data), "xx"));
        Assert.Contains("close delimiter", e.Message);
    }

    [Fact]
    public async Task BodyWithoutAnyBoundaryIsAFormatError()
    {
        var e = await Assert.ThrowsAsync<InputFormatException>(() => ReadAll(new MemoryStream(A("{\"not\":\"multipart\"}")), "xx"));
        Assert.Contains("no multipart boundary", e.Message);
    }

    [Fact]
    public async Task GarbageAfterABoundaryIsAFormatError()
    {
        var e = await Assert.ThrowsAsync<InputFormatException>(() => ReadAll(new MemoryStream(A("--xxZ\r\n\r\nb\r\n--xx--")), "xx"));
        Assert.Contains("after a multipart boundary", e.Message);
    }

    [Fact]
    public async Task SizeLimitsAreEnforcedWhileStreaming()
    {
        var data = Entity("xx", [new byte[5000], new byte[10]]);
        await Assert.ThrowsAsync<InputLimitException>(() => ReadAll(new MemoryStream(data), "xx", new DicomWebLimits(MaxPartBytes: 4999)));
        await Assert.ThrowsAsync<InputLimitException>(() => ReadAll(new MemoryStream(data), "xx", new DicomWebLimits(MaxParts: 1)));
        await Assert.ThrowsAsync<InputLimitException>(() => ReadAll(new MemoryStream(data), "xx", new DicomWebLimits(MaxTotalBytes: 5005)));
        var longHeader = A("--xx\r\nX: " + new string('h', 300) + "\r\n\r\nb\r\n--xx--");
        await Assert.ThrowsAsync<InputLimitException>(() => ReadAll(new MemoryStream(longHeader), "xx", new DicomWebLimits(MaxHeaderBytes: 100)));
        Assert.Equal(2, (await ReadAll(new MemoryStream(data), "xx", new DicomWebLimits(MaxPartBytes: 5000, MaxParts: 2, MaxTotalBytes: 5010))).Count);
    }

    [Theory]
    [InlineData("")]
    [InlineData("ends with space ")]
    public void InvalidBoundaryIsRefused(string boundary) =>
        // Src: RFC 2046 5.1.1 - boundary := 0*69<bchars> bcharsnospace (1 to 70 characters, not ending in a space).
        Assert.Throws<InputFormatException>(() => new MultipartRelatedReader(new MemoryStream(), boundary));

    [Theory]
    [InlineData("multipart/related; boundary=\"unterminated")]
    [InlineData("multipart")]
    [InlineData("multipart/related; boundary")]
    [InlineData("multipart/related boundary=x")]
    public void MalformedContentTypeIsAFormatError(string text) =>
        Assert.Throws<InputFormatException>(() => MimeContentType.Parse(text, "test"));

    private sealed class StalledStream : MemoryStream
    {
        public override async ValueTask<int> ReadAsync(Memory<byte> buffer, CancellationToken ct = default)
        {
            await Task.Delay(Timeout.Infinite, ct);
            return 0;
        }
    }

    [Fact]
    public async Task AStalledStreamIsCutOffWithAClearError()
    {
        var reader = new MultipartRelatedReader(new StalledStream(), "xx", idleTimeout: TimeSpan.FromMilliseconds(50));
        var e = await Assert.ThrowsAsync<DicomWebException>(() => reader.ReadNextAsync(_ => Stream.Null));
        Assert.Contains("stalled", e.Message);
    }
}
