using System.Runtime.CompilerServices;

namespace Serimetry.Engine.Imaging;

/// <summary>
/// The cubic B-spline: its recursive interpolation prefilter (pole z = √3 − 2, gain 6; Unser, Aldroubi &amp;
/// Eden, "Fast B-spline transforms for continuous image representation and interpolation", IEEE PAMI 13(3), 1991; boundary handling of Thévenaz, Blu &amp; Unser,
/// "Interpolation revisited", IEEE TMI 19(7), 2000) and its 4-tap evaluation weights, both with whole-sample
/// mirror boundaries (period 2n−2).
/// </summary>
internal static class BSplineKernel
{
    public static readonly double Pole = Math.Sqrt(3) - 2;

    /// <summary>Turns samples into B-spline coefficients in place (one line).</summary>
    public static void Prefilter(Span<double> c)
    {
        int n = c.Length;
        if (n < 2) return;
        double z = Pole;
        double gain = (1 - z) * (1 - 1 / z);
        for (int k = 0; k < n; k++) c[k] *= gain;
        c[0] = CausalInit(c, z);
        for (int k = 1; k < n; k++) c[k] += z * c[k - 1];
        c[n - 1] = z / (z * z - 1) * (c[n - 1] + z * c[n - 2]);
        for (int k = n - 2; k >= 0; k--) c[k] = z * (c[k + 1] - c[k]);
    }

    /// <summary>
    /// c⁺(0) = Σ_{j≥0} z^j s(j) over the mirrored, (2n−2)-periodic signal, summed exactly:
    /// [s0 + z^{n−1}s_{n−1} + Σ_{k=1}^{n−2}(z^k + z^{2n−2−k}) s_k] / (1 − z^{2n−2}); truncated once z^k &lt; 1e-15.
    /// </summary>
    private static double CausalInit(ReadOnlySpan<double> s, double z)
    {
        int n = s.Length;
        int horizon = (int)Math.Ceiling(Math.Log(1e-15) / Math.Log(Math.Abs(z)));
        if (horizon < n)
        {
            double sum = s[0], zk = z;
            for (int k = 1; k < horizon; k++, zk *= z) sum += zk * s[k];
            return sum;
        }
        double zn1 = Math.Pow(z, n - 1);
        double z2n2 = zn1 * zn1;
        double total = s[0] + zn1 * s[n - 1];
        double zkk = z;
        for (int k = 1; k < n - 1; k++, zkk *= z) total += (zkk + z2n2 / zkk) * s[k];
        return total / (1 - z2n2);
    }

    /// <summary>Indices (mirrored into 0..n−1) and weights of the 4 coefficients that shape position <paramref name="c"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Taps(double c, int n, Span<int> index, Span<double> weight)
    {
        double f = Math.Floor(c);
        int i0 = (int)f;
        double t = c - f;
        double t2 = t * t, t3 = t2 * t, u = 1 - t;
        weight[0] = u * u * u / 6;
        weight[1] = (3 * t3 - 6 * t2 + 4) / 6;
        weight[2] = (-3 * t3 + 3 * t2 + 3 * t + 1) / 6;
        weight[3] = t3 / 6;
        for (int k = 0; k < 4; k++) index[k] = Mirror(i0 - 1 + k, n);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Mirror(int k, int n)
    {
        if (n == 1) return 0;
        int period = 2 * n - 2;
        k = Math.Abs(k) % period;
        return k >= n ? period - k : k;
    }
}
