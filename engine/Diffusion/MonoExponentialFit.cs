namespace Serimetry.Engine.Diffusion;

/// <summary>
/// Per-voxel mono-exponential fits S(b) = S0·exp(−b·D) (b in s/mm², D in mm²/s). Scratch arrays belong to
/// the caller so the hot loop allocates nothing per voxel.
/// </summary>
internal static class MonoExponentialFit
{
    /// <summary>Weighted least squares of ln S on b; returns false with fewer than two distinct b-values.</summary>
    internal static bool LogLinear(ReadOnlySpan<double> b, ReadOnlySpan<double> s, ReadOnlySpan<double> w, int n, out double s0, out double d)
    {
        s0 = d = 0;
        double sw = 0, sx = 0, sy = 0;
        for (int i = 0; i < n; i++) { sw += w[i]; sx += w[i] * b[i]; sy += w[i] * Math.Log(s[i]); }
        if (n < 2 || sw <= 0) return false;
        double mx = sx / sw, my = sy / sw, sxx = 0, sxy = 0;
        for (int i = 0; i < n; i++)
        {
            double dx = b[i] - mx;
            sxx += w[i] * dx * dx;
            sxy += w[i] * dx * (Math.Log(s[i]) - my);
        }
        if (!(sxx > 1e-12 * sw * (1 + mx * mx))) return false;
        double slope = sxy / sxx;
        d = -slope;
        s0 = Math.Exp(my - slope * mx);
        return double.IsFinite(d) && double.IsFinite(s0);
    }

    /// <summary>The model signal √((S0·exp(−b·D))² + σ²) (σ = 0: plain mono-exponential).</summary>
    internal static double Model(double b, double s0, double d, double sigma)
    {
        double g = s0 * Math.Exp(-b * d);
        return sigma > 0 ? Math.Sqrt(g * g + sigma * sigma) : g;
    }

    /// <summary>
    /// Levenberg-Marquardt least squares of S on the noise-floor model, from (s0, d); at most 60 iterations,
    /// stopping when the relative step is below 1e-10. Returns false when the fit diverges.
    /// </summary>
    internal static bool NonLinear(ReadOnlySpan<double> b, ReadOnlySpan<double> s, int n, double sigma, ref double s0, ref double d)
    {
        double lambda = 1e-3;
        double cost = Cost(b, s, n, s0, d, sigma);
        for (int iter = 0; iter < 60; iter++)
        {
            double a00 = 0, a01 = 0, a11 = 0, g0 = 0, g1 = 0;
            for (int i = 0; i < n; i++)
            {
                double e = Math.Exp(-b[i] * d), g = s0 * e, f = sigma > 0 ? Math.Sqrt(g * g + sigma * sigma) : g;
                double ratio = f > 0 ? g / f : 1;
                double j0 = ratio * e, j1 = -ratio * b[i] * g, r = s[i] - f;
                a00 += j0 * j0; a01 += j0 * j1; a11 += j1 * j1; g0 += j0 * r; g1 += j1 * r;
            }
            bool improved = false;
            for (int tries = 0; tries < 12 && !improved; tries++)
            {
                double m00 = a00 * (1 + lambda), m11 = a11 * (1 + lambda), det = m00 * m11 - a01 * a01;
                if (!(Math.Abs(det) > 0)) { lambda *= 10; continue; }
                double ds0 = (m11 * g0 - a01 * g1) / det, dd = (m00 * g1 - a01 * g0) / det;
                double ns0 = s0 + ds0, nd = d + dd, nc = Cost(b, s, n, ns0, nd, sigma);
                if (nc <= cost && ns0 > 0)
                {
                    bool small = Math.Abs(ds0) <= 1e-10 * Math.Abs(ns0) && Math.Abs(dd) <= 1e-10 * Math.Max(Math.Abs(nd), 1e-9);
                    s0 = ns0; d = nd; cost = nc; lambda = Math.Max(lambda / 10, 1e-12); improved = true;
                    if (small) return double.IsFinite(d);
                }
                else lambda *= 10;
            }
            if (!improved) break;
        }
        return double.IsFinite(d) && double.IsFinite(s0);
    }

    private static double Cost(ReadOnlySpan<double> b, ReadOnlySpan<double> s, int n, double s0, double d, double sigma)
    {
        double c = 0;
        for (int i = 0; i < n; i++) { double r = s[i] - Model(b[i], s0, d, sigma); c += r * r; }
        return c;
    }

    /// <summary>R² of the model against the measured signal; 1 for an exact fit of constant data.</summary>
    internal static double RSquared(ReadOnlySpan<double> b, ReadOnlySpan<double> s, int n, double s0, double d, double sigma)
    {
        double mean = 0;
        for (int i = 0; i < n; i++) mean += s[i];
        mean /= n;
        double ssRes = 0, ssTot = 0;
        for (int i = 0; i < n; i++)
        {
            double r = s[i] - Model(b[i], s0, d, sigma);
            ssRes += r * r;
            ssTot += (s[i] - mean) * (s[i] - mean);
        }
        if (ssTot <= 0) return ssRes <= 0 ? 1 : 0;
        return 1 - ssRes / ssTot;
    }
}
