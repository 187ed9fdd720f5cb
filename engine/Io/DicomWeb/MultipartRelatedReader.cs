using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>The header fields of one multipart body part (names lower-cased).</summary>
public sealed record MultipartPartHeaders(IReadOnlyDictionary<string, string> Fields)
{
    /// <summary>The part's Content-Type value, or null.</summary>
    public string? ContentType => Fields.TryGetValue("content-type", out var v) ? v : null;
}

/// <summary>
/// Streams the body parts of a multipart entity (RFC 2046 5.1; multipart/related, RFC 2387) one at a time into
/// caller-supplied streams, with bounded memory: the buffer holds at most one read plus the delimiter length,
/// whatever the part sizes. The preamble before the first delimiter and the epilogue after the close delimiter
/// are discarded; a delimiter may be split across reads; transport padding (spaces, tabs) after a delimiter is
/// skipped. Sizes are checked against <see cref="DicomWebLimits"/> while streaming. A stalled stream is cut off
/// after <c>idleTimeout</c> without data.
/// </summary>
public sealed class MultipartRelatedReader
{
    private const int BufferSize = 64 * 1024;

    private readonly Stream _stream;
    private readonly byte[] _delimiter; // CRLF "--" boundary (RFC 2046 5.1.1)
    private readonly DicomWebLimits _limits;
    private readonly string _where;
    private readonly TimeSpan _idleTimeout;
    private readonly byte[] _buf;
    private int _start;
    private int _end;
    private bool _eof;
    private bool _started;
    private bool _finished;
    private int _parts;
    private long _totalBytes;

    public MultipartRelatedReader(Stream stream, string boundary, DicomWebLimits? limits = null, string where = "multipart body",
        TimeSpan? idleTimeout = null)
    {
        ArgumentNullException.ThrowIfNull(stream);
        // RFC 2046 5.1.1: 1 to 70 characters, no trailing space.
        if (string.IsNullOrEmpty(boundary) || boundary.Length > 70 || boundary.EndsWith(' ') || boundary.Any(c => c > 126 || c < 32))
            throw new InputFormatException($"multipart boundary '{boundary}' is not 1-70 printable characters", where,
                "the server's Content-Type boundary parameter breaks RFC 2046 5.1.1; check the server");
        _stream = stream;
        _delimiter = Encoding.ASCII.GetBytes("\r\n--" + boundary);
        _limits = limits ?? DicomWebLimits.Default;
        _where = where;
        _idleTimeout = idleTimeout ?? Timeout.InfiniteTimeSpan;
        _buf = new byte[Math.Max(BufferSize, 4 * _delimiter.Length)];
        // The first delimiter may open the body without a preceding CRLF: a virtual CRLF makes it match like the others.
        _buf[0] = (byte)'\r';
        _buf[1] = (byte)'\n';
        _end = 2;
    }

    /// <summary>Parts read so far.</summary>
    public int PartCount => _parts;

    /// <summary>Body bytes of all parts read so far.</summary>
    public long TotalBytes => _totalBytes;

    /// <summary>
    /// Reads the next part: calls <paramref name="openBody"/> with its headers to get the destination stream, copies
    /// the body into it and returns the headers; returns null after the close delimiter. The caller disposes the stream.
    /// </summary>
    public async Task<MultipartPartHeaders?> ReadNextAsync(Func<MultipartPartHeaders, Stream> openBody, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(openBody);
        if (_finished) return null;
        if (!_started)
        {
            await CopyUntilDelimiterAsync(null, _limits.MaxPartBytes, "the preamble", ct);
            _started = true;
        }
        if (await AtCloseDelimiterAsync(ct))
        {
            _finished = true;
            return null;
        }
        if (++_parts > _limits.MaxParts)
            throw new InputLimitException($"the response holds more than {_limits.MaxParts:N0} parts", _where,
                "retrieve the study series by series, or raise the limit");
        var headers = await ReadHeadersAsync(ct);
        var dest = openBody(headers);
        long n = await CopyUntilDelimiterAsync(dest, _limits.MaxPartBytes, $"part {_parts}", ct);
        _totalBytes += n;
        if (_totalBytes > _limits.MaxTotalBytes)
            throw new InputLimitException($"the response exceeds {_limits.MaxTotalBytes:N0} bytes in total", _where,
                "retrieve the study series by series, or raise the limit");
        return headers;
    }

    /// <summary>After a delimiter: "--" closes the body; otherwise skip transport padding and the CRLF that ends the line.</summary>
    private async Task<bool> AtCloseDelimiterAsync(CancellationToken ct)
    {
        if (!await EnsureAsync(2, ct)) throw Truncated("after a boundary");
        if (_buf[_start] == '-' && _buf[_start + 1] == '-')
        {
            _start += 2;
            return true; // the epilogue that may follow is ignored (RFC 2046 5.1.1)
        }
        while (true)
        {
            if (!await EnsureAsync(2, ct)) throw Truncated("after a boundary");
            byte b = _buf[_start];
            if (b is (byte)' ' or (byte)'\t')
            {
                _start++;
                continue;
            }
            if (b == '\r' && _buf[_start + 1] == '\n')
            {
                _start += 2;
                return false;
            }
            throw new InputFormatException($"unexpected byte 0x{b:X2} after a multipart boundary (part {_parts + 1})", _where,
                "the boundary line must end with CRLF (RFC 2046 5.1.1); check the server");
        }
    }

    private async Task<MultipartPartHeaders> ReadHeadersAsync(CancellationToken ct)
    {
        var fields = new Dictionary<string, string>(StringComparer.Ordinal);
        int used = 0;
        while (true)
        {
            int eol = _buf.AsSpan(_start, _end - _start).IndexOf("\r\n"u8);
            if (eol < 0)
            {
                if (_end - _start + used > _limits.MaxHeaderBytes) throw HeaderTooLarge();
                if (_eof) throw Truncated("inside part headers");
                await FillAsync(ct);
                continue;
            }
            used += eol + 2;
            if (used > _limits.MaxHeaderBytes) throw HeaderTooLarge();
            var line = Encoding.Latin1.GetString(_buf, _start, eol);
            _start += eol + 2;
            if (line.Length == 0) return new MultipartPartHeaders(fields);
            int colon = line.IndexOf(':');
            if (colon <= 0)
                throw new InputFormatException($"malformed header line in part {_parts}", _where, "each part header needs 'Name: value'; check the server");
            fields[line[..colon].Trim().ToLowerInvariant()] = line[(colon + 1)..].Trim();
        }
    }

    /// <summary>Copies bytes up to the next delimiter into <paramref name="dest"/> (null: discard) and consumes the delimiter.</summary>
    private async Task<long> CopyUntilDelimiterAsync(Stream? dest, long maxBytes, string what, CancellationToken ct)
    {
        long copied = 0;
        while (true)
        {
            int idx = _buf.AsSpan(_start, _end - _start).IndexOf(_delimiter);
            int take = idx >= 0 ? idx : Math.Max(0, _end - _start - (_delimiter.Length - 1)); // keep a possible delimiter prefix
            copied += take;
            if (copied > maxBytes)
                throw new InputLimitException($"{what} exceeds {maxBytes:N0} bytes", _where, "the instance is larger than the limit allows");
            if (dest is not null && take > 0) await dest.WriteAsync(_buf.AsMemory(_start, take), ct);
            _start += take;
            if (idx >= 0)
            {
                _start += _delimiter.Length;
                return copied;
            }
            if (_eof)
                throw _started ? Truncated($"inside {what}") : new InputFormatException("the response holds no multipart boundary", _where,
                    "the body does not match its Content-Type boundary; check the server");
            await FillAsync(ct);
        }
    }

    /// <summary>Makes at least <paramref name="count"/> bytes available; false when the stream ends first.</summary>
    private async Task<bool> EnsureAsync(int count, CancellationToken ct)
    {
        while (_end - _start < count)
        {
            if (_eof) return false;
            await FillAsync(ct);
        }
        return true;
    }

    private async Task FillAsync(CancellationToken ct)
    {
        if (_start > 0)
        {
            Buffer.BlockCopy(_buf, _start, _buf, 0, _end - _start);
            _end -= _start;
            _start = 0;
        }
        using var idle = CancellationTokenSource.CreateLinkedTokenSource(ct);
        idle.CancelAfter(_idleTimeout);
        int n;
        try
        {
            n = await _stream.ReadAsync(_buf.AsMemory(_end), idle.Token);
        }
        catch (OperationCanceledException) when (!ct.IsCancellationRequested)
        {
            throw new DicomWebException($"the response stalled: no data for {_idleTimeout.TotalSeconds:0} s (part {_parts})", _where,
                "the server or network is too slow; try again or raise the timeout");
        }
        if (n == 0) _eof = true;
        _end += n;
    }

    private InputFormatException Truncated(string where) =>
        new($"the multipart response ends {where} (part {_parts}), before its close delimiter", _where,
            "the transfer was cut off; try again");

    private InputLimitException HeaderTooLarge() =>
        new($"the headers of part {_parts} exceed {_limits.MaxHeaderBytes:N0} bytes", _where, "check the server");
}
