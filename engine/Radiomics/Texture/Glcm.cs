using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// Grey level co-occurrence matrix (IBSI 3.6, family LFYI): symmetric counts of grey-level pairs
/// (i, j) at offset δ·direction, both voxels in the intensity mask. Features follow IBSI 3.6.1–3.6.25
/// with log base 2 for entropies.
/// </summary>
internal sealed class Glcm(RoiData roi) : IDirectionalMatrix
{
    public static readonly (string Name, string Code)[] Names =
    [
        ("Joint maximum", "GYBY"), ("Joint average", "60VM"), ("Joint variance", "UR99"), ("Joint entropy", "TU9B"),
        ("Difference average", "TF7R"), ("Difference variance", "D3YU"), ("Difference entropy", "NTRS"),
        ("Sum average", "ZGXS"), ("Sum variance", "OEEB"), ("Sum entropy", "P6QZ"), ("Angular second moment", "8ZQL"),
        ("Contrast", "ACUI"), ("Dissimilarity", "8S9J"), ("Inverse difference", "IB1Z"),
        ("Normalised inverse difference", "NDRX"), ("Inverse difference moment", "WF0Z"),
        ("Normalised inverse difference moment", "1QCO"), ("Inverse variance", "E8JP"), ("Correlation", "NI2N"),
        ("Autocorrelation", "QWB0"), ("Cluster tendency", "DG8W"), ("Cluster shade", "7NFM"),
        ("Cluster prominence", "AE86"), ("Information correlation 1", "R8DG"), ("Information correlation 2", "JN9H"),
    ];

    private readonly int _ng = roi.BinCount;
    private readonly double[] _px = new double[roi.BinCount];
    private readonly double[] _diff = new double[roi.BinCount];
    private readonly double[] _sum = new double[2 * roi.BinCount + 1];

    public int Length => _ng * _ng;
    public int FeatureCount => Names.Length;

    public void Accumulate(int slice, int dx, int dy, int dz, double[] m)
    {
        int z0 = slice < 0 ? 0 : slice, z1 = slice < 0 ? roi.Nz : slice + 1;
        var inRoi = roi.InRoi;
        var levels = roi.Levels;
        for (int z = z0; z < z1; z++)
        {
            int zz = z + dz;
            if ((uint)zz >= (uint)roi.Nz) continue;
            for (int y = 0; y < roi.Ny; y++)
            {
                int yy = y + dy;
                if ((uint)yy >= (uint)roi.Ny) continue;
                int row = roi.Index(0, y, z), rowN = roi.Index(0, yy, zz);
                int xs = Math.Max(0, -dx), xe = Math.Min(roi.Nx, roi.Nx - dx);
                for (int x = xs; x < xe; x++)
                {
                    int n = row + x, nn = rowN + x + dx;
                    if (inRoi[n] == 0 || inRoi[nn] == 0) continue;
                    int a = levels[n] - 1, b = levels[nn] - 1;
                    m[a * _ng + b]++;
                    m[b * _ng + a]++;
                }
            }
        }
    }

    public void Features(double[] m, Span<double> r)
    {
        int ng = _ng;
        double total = 0;
        foreach (var c in m) total += c;
        Array.Clear(_px); Array.Clear(_diff); Array.Clear(_sum);
        double jmax = 0, mu = 0, hxy = 0, asm = 0, contrast = 0, dissim = 0, id = 0, nid = 0, idm = 0, nidm = 0, invVar = 0, auto = 0;
        for (int i = 0; i < ng; i++)
        for (int j = 0; j < ng; j++)
        {
            double p = m[i * ng + j] / total;
            if (p == 0) continue;
            int k = Math.Abs(i - j);
            double gi = i + 1, gj = j + 1;
            _px[i] += p; _diff[k] += p; _sum[i + j + 2] += p;
            if (p > jmax) jmax = p;
            mu += gi * p;
            hxy -= p * Math.Log2(p);
            asm += p * p;
            contrast += k * k * p; dissim += k * p;
            id += p / (1.0 + k); nid += p / (1.0 + (double)k / ng);
            idm += p / (1.0 + k * k); nidm += p / (1.0 + (double)k * k / ((double)ng * ng));
            if (k > 0) invVar += p / (k * k);
            auto += gi * gj * p;
        }
        double jvar = 0, tend = 0, shade = 0, prom = 0, hxy1 = 0, hxy2 = 0, hx = 0;
        for (int i = 0; i < ng; i++)
        {
            double pi = _px[i];
            if (pi > 0) { hx -= pi * Math.Log2(pi); jvar += (i + 1 - mu) * (i + 1 - mu) * pi; }
            for (int j = 0; j < ng; j++)
            {
                double pj = _px[j], pipj = pi * pj;
                if (pipj > 0) hxy2 -= pipj * Math.Log2(pipj);
                double p = m[i * ng + j] / total;
                if (p == 0) continue;
                hxy1 -= p * Math.Log2(pipj);
                double s = i + j + 2 - 2 * mu, s2 = s * s;
                tend += s2 * p; shade += s2 * s * p; prom += s2 * s2 * p;
            }
        }
        var (dAvg, dVar, dEnt) = Moments(_diff, 0, ng);
        var (sAvg, sVar, sEnt) = Moments(_sum, 2, 2 * ng + 1);
        r[0] = jmax; r[1] = mu; r[2] = jvar; r[3] = hxy; r[4] = dAvg; r[5] = dVar; r[6] = dEnt;
        r[7] = sAvg; r[8] = sVar; r[9] = sEnt; r[10] = asm; r[11] = contrast; r[12] = dissim; r[13] = id;
        r[14] = nid; r[15] = idm; r[16] = nidm; r[17] = invVar;
        r[18] = jvar > 0 ? (auto - mu * mu) / jvar : double.NaN;
        r[19] = auto; r[20] = tend; r[21] = shade; r[22] = prom;
        r[23] = hx > 0 ? (hxy - hxy1) / hx : double.NaN;
        r[24] = Math.Sqrt(Math.Max(0, 1 - Math.Exp(-2 * (hxy2 - hxy))));
    }

    // Mean, variance and entropy of a distribution p[k] over k = from..to−1.
    private static (double Mean, double Variance, double Entropy) Moments(double[] p, int from, int to)
    {
        double mean = 0, entropy = 0, variance = 0;
        for (int k = from; k < to; k++)
        {
            if (p[k] == 0) continue;
            mean += k * p[k];
            entropy -= p[k] * Math.Log2(p[k]);
        }
        for (int k = from; k < to; k++) variance += (k - mean) * (k - mean) * p[k];
        return (mean, variance, entropy);
    }
}
