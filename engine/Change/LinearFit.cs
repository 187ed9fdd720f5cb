using MathNet.Numerics.Distributions;

namespace Serimetry.Engine.Change;

/// <summary>
/// Ordinary least-squares line y = a + b·x with the usual inference: SE(b) = s/√Sxx with
/// s² = SSE/(n−2), and the 95 % CI b ± t(0.975, n−2)·SE(b) (Student t quantile from MathNet.Numerics).
/// Sums are taken about the means, which keeps the fit exact to ~1e-12 on the NIST StRD Norris data.
/// </summary>
internal sealed record LinearFit(double Intercept, double Slope, double SlopeSe, int N, double SlopeCiLow, double SlopeCiHigh)
{
    /// <summary>Degrees of freedom n − 2.</summary>
    public int DegreesOfFreedom => N - 2;

    /// <summary>Fits at least two points with at least two distinct x; the CI is NaN with fewer than three points.</summary>
    public static LinearFit Fit(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        if (x.Length != y.Length) throw new ArgumentException("x and y differ in length");
        int n = x.Length;
        if (n < 2) throw new ArgumentException("a line needs at least two points");
        double mx = 0, my = 0;
        for (int i = 0; i < n; i++) { mx += x[i]; my += y[i]; }
        mx /= n;
        my /= n;
        double sxx = 0, sxy = 0;
        for (int i = 0; i < n; i++)
        {
            double dx = x[i] - mx;
            sxx += dx * dx;
            sxy += dx * (y[i] - my);
        }
        if (sxx == 0) throw new ArgumentException("all x are equal; the slope is undefined");
        double b = sxy / sxx, a = my - b * mx;
        if (n < 3) return new LinearFit(a, b, double.NaN, n, double.NaN, double.NaN);
        double sse = 0;
        for (int i = 0; i < n; i++)
        {
            double r = y[i] - a - b * x[i];
            sse += r * r;
        }
        double se = Math.Sqrt(sse / (n - 2) / sxx);
        double t = TQuantile975(n - 2);
        return new LinearFit(a, b, se, n, b - t * se, b + t * se);
    }

    /// <summary>The 0.975 quantile of Student's t with <paramref name="df"/> degrees of freedom.</summary>
    public static double TQuantile975(int df) => StudentT.InvCDF(0, 1, df, 0.975);
}
