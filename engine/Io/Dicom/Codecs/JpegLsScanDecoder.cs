using System.Numerics;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// Lossless (NEAR = 0) JPEG-LS decoding of one scan, ITU-T T.87 Annex A: gradient quantisation into 365
/// regular contexts (A.3), median edge prediction with bias correction (A.4), limited-length Golomb codes
/// (A.5), context update (A.6) and run mode with run interruption samples (A.7). Lines are decoded into
/// buffers padded by one sample on each side, which carry the edge rules of A.2.1 (Ra = Rb and Rc = the
/// previous line's Ra at the start of a line, Rd = Rb at its end).
/// </summary>
internal sealed class JpegLsScanDecoder
{
    private const int RegularContexts = 365;
    private const int MinC = -128, MaxC = 127;
    private static readonly int[] J =
        [0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 5, 5, 6, 6, 7, 7, 8, 9, 10, 11, 12, 13, 14, 15];

    private readonly JpegLsCodingParameters _p;
    private readonly int _range, _qbpp, _limit;
    private readonly int[] _a = new int[RegularContexts + 2];
    private readonly int[] _b = new int[RegularContexts + 2];
    private readonly int[] _c = new int[RegularContexts + 2];
    private readonly int[] _n = new int[RegularContexts + 2];
    private readonly int[] _nn = new int[2];
    private readonly int[] _runIndex;
    private readonly sbyte[] _quantized;

    public JpegLsScanDecoder(JpegLsCodingParameters parameters, int components)
    {
        _p = parameters;
        _range = parameters.Range;
        _qbpp = parameters.Qbpp;
        _limit = parameters.Limit;
        _runIndex = new int[components];
        int a = Math.Max(2, (_range + 32) >> 6);
        Array.Fill(_a, a);
        Array.Fill(_n, 1);
        _quantized = new sbyte[2 * parameters.T3 + 1];
        for (int d = -parameters.T3; d <= parameters.T3; d++) _quantized[d + parameters.T3] = QuantizeSlow(d, parameters);
    }

    /// <summary>Decodes one line of component <paramref name="component"/>: samples go to cur[1..width].</summary>
    public void DecodeLine(ref JpegLsBitReader reader, Span<int> prev, Span<int> cur, int width, int component)
    {
        int x = 1;
        while (x <= width)
        {
            int ra = cur[x - 1], rb = prev[x], rc = prev[x - 1], rd = prev[x + 1];
            int d1 = rd - rb, d2 = rb - rc, d3 = rc - ra;
            if (d1 == 0 && d2 == 0 && d3 == 0)
            {
                x = DecodeRun(ref reader, prev, cur, x, width, component);
                continue;
            }
            int q = (Quantize(d1) * 9 + Quantize(d2)) * 9 + Quantize(d3);
            cur[x] = DecodeRegular(ref reader, q, ra, rb, rc);
            x++;
        }
    }

    /// <summary>
    /// Decodes one line of a sample-interleaved scan (ILV = 2): <paramref name="prev"/> and <paramref name="cur"/>
    /// hold <paramref name="count"/> interleaved samples per position, position 0 and width + 1 being the edges.
    /// Contexts are shared; run mode needs zero gradients in every component and codes whole pixels, and its
    /// interruption codes each component with the Ra != Rb context (T.87 A.7.2 for ILV = 2, from memory; checked
    /// against GDCM-encoded colour images).
    /// </summary>
    public void DecodeInterleavedLine(ref JpegLsBitReader reader, Span<int> prev, Span<int> cur, int width, int count)
    {
        Span<int> contexts = stackalloc int[4];
        int x = 1;
        while (x <= width)
        {
            bool run = true;
            for (int c = 0; c < count; c++)
            {
                int at = x * count + c;
                int ra = cur[at - count], rb = prev[at], rc = prev[at - count], rd = prev[at + count];
                contexts[c] = (Quantize(rd - rb) * 9 + Quantize(rb - rc)) * 9 + Quantize(rc - ra);
                run &= contexts[c] == 0;
            }
            if (run)
            {
                x = DecodeInterleavedRun(ref reader, prev, cur, x, width, count);
                continue;
            }
            for (int c = 0; c < count; c++)
            {
                int at = x * count + c;
                cur[at] = DecodeRegular(ref reader, contexts[c], cur[at - count], prev[at], prev[at - count]);
            }
            x++;
        }
    }

    private int DecodeInterleavedRun(ref JpegLsBitReader reader, Span<int> prev, Span<int> cur, int x, int width, int count)
    {
        int length = DecodeRunLength(ref reader, width - x + 1, 0, out bool interrupted);
        for (int i = 0; i < length; i++) cur.Slice((x - 1) * count, count).CopyTo(cur.Slice((x + i) * count, count));
        x += length;
        if (!interrupted) return x;
        ref int runIndex = ref _runIndex[0];
        for (int c = 0; c < count; c++)
        {
            int at = x * count + c;
            int ra = cur[at - count], rb = prev[at];
            int error = DecodeInterruptionError(ref reader, 0, runIndex);
            cur[at] = Wrap(rb + (rb < ra ? -error : error));
        }
        if (runIndex > 0) runIndex--;
        return x + 1;
    }

    /// <summary>Run length of T.87 A.7.1.2; <paramref name="interrupted"/> when an interruption sample follows.</summary>
    private int DecodeRunLength(ref JpegLsBitReader reader, int remaining, int component, out bool interrupted)
    {
        int count = 0;
        ref int runIndex = ref _runIndex[component];
        while (reader.ReadBit())
        {
            int segment = 1 << J[runIndex];
            int take = Math.Min(segment, remaining - count);
            count += take;
            if (take == segment && runIndex < 31) runIndex++;
            if (count == remaining) break;
        }
        interrupted = count < remaining;
        if (interrupted)
        {
            count += reader.Read(J[runIndex]);
            if (count >= remaining)
                throw CodecErrors.Malformed("JPEG-LS", $"a run of {count} samples is longer than the {remaining} left in the line", reader.Position);
        }
        return count;
    }

    /// <summary>Gradient quantisation of T.87 A.3.3 (NEAR = 0) through a table over -T3..T3.</summary>
    private int Quantize(int d)
    {
        if (d <= -_p.T3) return -4;
        if (d >= _p.T3) return 4;
        return _quantized[d + _p.T3];
    }

    private static sbyte QuantizeSlow(int d, JpegLsCodingParameters p)
    {
        if (d <= -p.T3) return -4;
        if (d <= -p.T2) return -3;
        if (d <= -p.T1) return -2;
        if (d < 0) return -1;
        if (d == 0) return 0;
        if (d < p.T1) return 1;
        if (d < p.T2) return 2;
        if (d < p.T3) return 3;
        return 4;
    }

    /// <summary>Golomb parameter: the least k with N &lt;&lt; k &gt;= A (T.87 A.5.1), capped for corrupt data.</summary>
    private static int GolombK(int n, int a)
    {
        if (n >= a) return 0;
        int k = BitOperations.Log2((uint)(a / n));
        if ((n << k) < a) k++;
        return Math.Min(k, 24);
    }

    private int DecodeRegular(ref JpegLsBitReader reader, int q, int ra, int rb, int rc)
    {
        int sign = 1;
        if (q < 0) { sign = -1; q = -q; }
        int px = Median(ra, rb, rc) + sign * _c[q];
        if (px < 0) px = 0;
        else if (px > _p.MaxVal) px = _p.MaxVal;

        int k = GolombK(_n[q], _a[q]);
        int mapped = DecodeGolomb(ref reader, k, _limit);
        int error = k == 0 && 2 * _b[q] <= -_n[q]
            ? ((mapped & 1) != 0 ? (mapped - 1) >> 1 : -(mapped >> 1) - 1)
            : ((mapped & 1) != 0 ? -((mapped + 1) >> 1) : mapped >> 1);
        UpdateRegular(q, error);
        return Wrap(px + sign * error);
    }

    private static int Median(int ra, int rb, int rc)
    {
        int max = Math.Max(ra, rb), min = Math.Min(ra, rb);
        if (rc >= max) return min;
        if (rc <= min) return max;
        return ra + rb - rc;
    }

    private void UpdateRegular(int q, int error)
    {
        int b = _b[q] + error;
        _a[q] += Math.Abs(error);
        int n = _n[q];
        if (n == _p.Reset)
        {
            _a[q] >>= 1;
            b = b >= 0 ? b >> 1 : -((1 - b) >> 1);
            n >>= 1;
        }
        n++;
        if (b <= -n)
        {
            b += n;
            if (_c[q] > MinC) _c[q]--;
            if (b <= -n) b = -n + 1;
        }
        else if (b > 0)
        {
            b -= n;
            if (_c[q] < MaxC) _c[q]++;
            if (b > 0) b = 0;
        }
        _b[q] = b;
        _n[q] = n;
    }

    /// <summary>Run mode (T.87 A.7.1): returns the column after the run and any interruption sample.</summary>
    private int DecodeRun(ref JpegLsBitReader reader, Span<int> prev, Span<int> cur, int x, int width, int component)
    {
        int ra = cur[x - 1];
        int count = DecodeRunLength(ref reader, width - x + 1, component, out bool interrupted);
        ref int runIndex = ref _runIndex[component];
        cur.Slice(x, count).Fill(ra);
        x += count;
        if (!interrupted) return x;
        cur[x] = DecodeInterruption(ref reader, ra, prev[x], runIndex);
        if (runIndex > 0) runIndex--;
        return x + 1;
    }

    /// <summary>Run interruption sample (T.87 A.7.2) with contexts 365 (Ra != Rb) and 366 (Ra = Rb).</summary>
    private int DecodeInterruption(ref JpegLsBitReader reader, int ra, int rb, int runIndex)
    {
        int type = ra == rb ? 1 : 0;
        int error = DecodeInterruptionError(ref reader, type, runIndex);
        return type == 1 ? Wrap(ra + error) : Wrap(rb + (rb < ra ? -error : error));
    }

    /// <summary>The prediction error of a run interruption sample and the update of its context (T.87 A.7.2.2).</summary>
    private int DecodeInterruptionError(ref JpegLsBitReader reader, int type, int runIndex)
    {
        int q = RegularContexts + type;
        int temp = type == 1 ? _a[q] + (_n[q] >> 1) : _a[q];
        int k = GolombK(_n[q], temp);
        int mapped = DecodeGolomb(ref reader, k, _limit - J[runIndex] - 1);
        int t = mapped + type;
        int map = t & 1;
        int magnitude = (t + map) >> 1;
        bool negative = (k != 0 || 2 * _nn[type] >= _n[q]) == (map == 1);
        int error = negative ? -magnitude : magnitude;

        if (error < 0) _nn[type]++;
        _a[q] += (mapped + 1 - type) >> 1;
        if (_n[q] == _p.Reset)
        {
            _a[q] >>= 1;
            _n[q] >>= 1;
            _nn[type] >>= 1;
        }
        _n[q]++;
        return error;
    }

    /// <summary>Limited-length Golomb decoding (T.87 A.5.3) with escape after LIMIT - qbpp - 1 zeros.</summary>
    private int DecodeGolomb(ref JpegLsBitReader reader, int k, int limit)
    {
        int escape = limit - _qbpp - 1;
        int zeros = reader.ReadUnary(escape);
        if (zeros < escape) return (zeros << k) | reader.Read(k);
        return reader.Read(_qbpp) + 1;
    }

    /// <summary>Modulo-RANGE reconstruction (T.87 A.4.5); one wrap always suffices for a valid lossless stream.</summary>
    private int Wrap(int value)
    {
        if (value < 0) value += _range;
        else if (value > _p.MaxVal) value -= _range;
        if ((uint)value > (uint)_p.MaxVal)
            throw CodecErrors.Malformed("JPEG-LS", "a prediction error larger than the sample range (corrupt Golomb code)", 0);
        return value;
    }
}
