namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>
/// The lossless (NEAR = 0) coding parameters of a JPEG-LS scan: MAXVAL, the thresholds T1..T3 and RESET,
/// either from an LSE preset-parameters segment (T.87 C.2.4.1.1) or the defaults of T.87 C.2.4.1.1.1, and the
/// derived RANGE, qbpp, bpp and LIMIT (T.87 A.2.1).
/// </summary>
internal readonly record struct JpegLsCodingParameters(int MaxVal, int T1, int T2, int T3, int Reset)
{
    public int Range => MaxVal + 1;

    public int Qbpp => CeilLog2(Range);

    public int Limit
    {
        get
        {
            int bpp = Math.Max(2, CeilLog2(MaxVal + 1));
            return 2 * (bpp + Math.Max(8, bpp));
        }
    }

    /// <summary>
    /// Fills zero (unspecified) values with the defaults for <paramref name="precision"/> and checks the result.
    /// </summary>
    public static JpegLsCodingParameters Resolve(int precision, int maxVal, int t1, int t2, int t3, int reset)
    {
        const int Near = 0, BasicT1 = 3, BasicT2 = 7, BasicT3 = 21;
        if (maxVal == 0) maxVal = (1 << precision) - 1;
        int d1, d2, d3;
        if (maxVal >= 128)
        {
            int factor = (Math.Min(maxVal, 4095) + 128) >> 8;
            d1 = Clamp(factor * (BasicT1 - 2) + 2 + 3 * Near, Near + 1, maxVal);
            d2 = Clamp(factor * (BasicT2 - 3) + 3 + 5 * Near, d1, maxVal);
            d3 = Clamp(factor * (BasicT3 - 4) + 4 + 7 * Near, d2, maxVal);
        }
        else
        {
            int factor = 256 / (maxVal + 1);
            d1 = Clamp(Math.Max(2, BasicT1 / factor + 3 * Near), Near + 1, maxVal);
            d2 = Clamp(Math.Max(3, BasicT2 / factor + 5 * Near), d1, maxVal);
            d3 = Clamp(Math.Max(4, BasicT3 / factor + 7 * Near), d2, maxVal);
        }
        var p = new JpegLsCodingParameters(maxVal, t1 == 0 ? d1 : t1, t2 == 0 ? d2 : t2, t3 == 0 ? d3 : t3, reset == 0 ? 64 : reset);
        bool valid = p.MaxVal < 1 << precision && p.MaxVal >= 1 && p.T1 >= Near + 1 && p.T1 <= p.T2 && p.T2 <= p.T3 &&
                     p.T3 <= p.MaxVal && p.Reset >= 3 && p.Reset <= Math.Max(255, p.MaxVal);
        if (!valid)
            throw CodecErrors.Malformed("JPEG-LS", $"preset coding parameters MAXVAL {p.MaxVal}, T1 {p.T1}, T2 {p.T2}, T3 {p.T3}, RESET {p.Reset} " +
                $"break the limits of T.87 C.2.4.1.1 for {precision}-bit samples", 0);
        return p;
    }

    private static int Clamp(int value, int low, int maxVal) => value > maxVal || value < low ? low : value;

    private static int CeilLog2(int value)
    {
        int n = 0;
        while ((1 << n) < value) n++;
        return n;
    }
}
