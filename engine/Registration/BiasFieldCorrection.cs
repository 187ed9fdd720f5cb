using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>
/// A simple estimate of a smooth multiplicative intensity non-uniformity (bias) field, in the spirit of
/// N3/N4 (Sled et al., IEEE TMI 17(1), 1998; Tustison et al., IEEE TMI 29(6), 2010) but much cruder: the
/// log-intensity of body voxels (above the image mean) is fitted by least squares with a quadratic
/// polynomial in the physical coordinates, and the image is divided by exp(fit − mean fit). Tissue
/// contrast that varies slowly over the whole body is partly absorbed too; it is the same anatomy in both
/// images, so both are corrected alike.
/// </summary>
internal static class BiasFieldCorrection
{
    private const int Terms = 10;

    /// <summary>A fitted log-domain field: polynomial coefficients in (p − centre) / scale, constant term zero.</summary>
    internal sealed record Field(double[] Coefficients, Vec3 CenterMm, double ScaleMm);

    /// <summary>Estimates the field and divides it out.</summary>
    public static Volume<float> Correct(Volume<float> image, int maxThreads = -1) =>
        Estimate(image) is { } field ? Apply(image, field, maxThreads) : image;

    /// <summary>Fits the field on the whole image (null when no fit is possible).</summary>
    public static Field? Estimate(Volume<float> image)
    {
        var g = image.Geometry;
        var v = image.Voxels;
        double mean = 0;
        foreach (var x in v) mean += x;
        mean /= v.Length;
        if (!(mean > 0)) return null;
        var center = g.CenterMm;
        double scale = 0.5 * Math.Max(1, (new Vec3(g.Size.X, g.Size.Y, g.Size.Z).Scale(g.SpacingMm)).Norm);
        var ata = new double[Terms * Terms];
        var atb = new double[Terms];
        Span<double> phi = stackalloc double[Terms];
        int step = Math.Max(1, (int)Math.Cbrt(v.Length / 200000.0));
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j += step)
                for (int i = 0; i < g.Size.X; i += step)
                {
                    double val = image[i, j, k];
                    if (!(val > mean)) continue;
                    Basis((g.IndexToPhysical(i, j, k) - center) / scale, phi);
                    double y = Math.Log(val);
                    for (int a = 0; a < Terms; a++)
                    {
                        atb[a] += phi[a] * y;
                        for (int b = 0; b < Terms; b++) ata[a * Terms + b] += phi[a] * phi[b];
                    }
                }
        for (int a = 0; a < Terms; a++) ata[a * Terms + a] += 1e-6;
        if (!Solve(ata, atb)) return null;
        atb[0] = 0; // keep the overall level: divide by the field's variation only
        return new Field(atb, center, scale);
    }

    /// <summary>
    /// Divides <paramref name="image"/> by the field; the field lives in physical space, so it can be fitted
    /// on a whole image and applied to a crop of it.
    /// </summary>
    public static Volume<float> Apply(Volume<float> image, Field field, int maxThreads = -1)
    {
        var g = image.Geometry;
        var v = image.Voxels;
        var (atb, center, scale) = (field.Coefficients, field.CenterMm, field.ScaleMm);
        var result = new float[v.Length];
        var rowStep = g.IndexToPhysicalMatrix.Column(0) / scale;
        ParallelRange.For(g.Size.Z * g.Size.Y, 64, (_, start, end) =>
        {
            Span<double> basis = stackalloc double[Terms];
            for (int row = start; row < end; row++)
            {
                int j = row % g.Size.Y, k = row / g.Size.Y;
                // Along a row the point moves linearly, so the quadratic log-field is a quadratic in i.
                var p0 = (g.IndexToPhysical(0, j, k) - center) / scale;
                double a = LogField(p0, atb, basis);
                double fPlus = LogField(p0 + rowStep, atb, basis), fMinus = LogField(p0 - rowStep, atb, basis);
                double b = (fPlus - fMinus) / 2, c = (fPlus + fMinus) / 2 - a;
                int offset = g.Size.X * row;
                for (int i = 0; i < g.Size.X; i++)
                    result[offset + i] = (float)(v[offset + i] * Math.Exp(-(a + i * (b + i * c))));
            }
        }, maxThreads);
        return new Volume<float>(g, result);
    }

    private static double LogField(Vec3 p, double[] coefficients, Span<double> basis)
    {
        Basis(p, basis);
        double f = 0;
        for (int a = 1; a < Terms; a++) f += coefficients[a] * basis[a];
        return f;
    }

    private static void Basis(Vec3 p, Span<double> phi)
    {
        phi[0] = 1; phi[1] = p.X; phi[2] = p.Y; phi[3] = p.Z;
        phi[4] = p.X * p.X; phi[5] = p.Y * p.Y; phi[6] = p.Z * p.Z;
        phi[7] = p.X * p.Y; phi[8] = p.X * p.Z; phi[9] = p.Y * p.Z;
    }

    /// <summary>Gaussian elimination with partial pivoting; the solution replaces <paramref name="b"/>.</summary>
    private static bool Solve(double[] a, double[] b)
    {
        int n = b.Length;
        for (int c = 0; c < n; c++)
        {
            int piv = c;
            for (int r = c + 1; r < n; r++) if (Math.Abs(a[r * n + c]) > Math.Abs(a[piv * n + c])) piv = r;
            if (Math.Abs(a[piv * n + c]) < 1e-12) return false;
            if (piv != c)
            {
                for (int k = 0; k < n; k++) (a[c * n + k], a[piv * n + k]) = (a[piv * n + k], a[c * n + k]);
                (b[c], b[piv]) = (b[piv], b[c]);
            }
            for (int r = c + 1; r < n; r++)
            {
                double fct = a[r * n + c] / a[c * n + c];
                for (int k = c; k < n; k++) a[r * n + k] -= fct * a[c * n + k];
                b[r] -= fct * b[c];
            }
        }
        for (int r = n - 1; r >= 0; r--)
        {
            double s = b[r];
            for (int k = r + 1; k < n; k++) s -= a[r * n + k] * b[k];
            b[r] = s / a[r * n + r];
        }
        return true;
    }
}
