using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// Neighbourhood grey tone difference matrix (IBSI 3.10, family IPET): for grey level i, s_i sums
/// |i − Ā| over voxels of level i, Ā the mean level of the in-ROI neighbours; n_i counts those voxels.
/// Voxels without any in-ROI neighbour are left out (N_v,c = Σ n_i). Stored flat as [s_1..s_Ng, n_1..n_Ng].
/// </summary>
internal sealed class Ngtdm(RoiData roi, int distance) : IRegionMatrix
{
    public static readonly (string Name, string Code)[] Names =
        [("Coarseness", "QCDE"), ("Contrast", "65HE"), ("Busyness", "NQ30"), ("Complexity", "HDEZ"), ("Strength", "1X9X")];

    private readonly Neighbourhood _n2 = new(distance, is2D: true);
    private readonly Neighbourhood _n3 = new(distance, is2D: false);

    public int Length => 2 * roi.BinCount;
    public int FeatureCount => Names.Length;

    public double Accumulate(int slice, double[] m)
    {
        var nb = slice >= 0 ? _n2 : _n3;
        int ng = roi.BinCount, z0 = slice < 0 ? 0 : slice, z1 = slice < 0 ? roi.Nz : slice + 1;
        double voxels = 0;
        for (int z = z0; z < z1; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++)
        {
            int n = roi.Index(x, y, z);
            if (roi.InRoi[n] == 0) continue;
            int level = roi.Levels[n];
            var (sum, count, _) = nb.Scan(roi, x, y, z, level, 0);
            if (count == 0) continue;
            m[level - 1] += Math.Abs(level - sum / count);
            m[ng + level - 1]++;
            voxels++;
        }
        return voxels;
    }

    public void Features(double[] m, double voxelCount, Span<double> r)
    {
        int ng = roi.BinCount;
        double nvc = 0, sTotal = 0, ps = 0; int ngp = 0;
        for (int i = 0; i < ng; i++) { nvc += m[ng + i]; sTotal += m[i]; }
        for (int i = 0; i < ng; i++)
        {
            double p = m[ng + i] / nvc;
            if (p > 0) { ngp++; ps += p * m[i]; }
        }
        double contrastSum = 0, busyDen = 0, complexity = 0, strength = 0;
        for (int i = 0; i < ng; i++)
        {
            double pi = m[ng + i] / nvc;
            if (pi == 0) continue;
            for (int j = 0; j < ng; j++)
            {
                double pj = m[ng + j] / nvc;
                if (pj == 0) continue;
                double d = i - j;
                contrastSum += pi * pj * d * d;
                busyDen += Math.Abs((i + 1) * pi - (j + 1) * pj);
                complexity += Math.Abs(d) * (pi * m[i] + pj * m[j]) / (pi + pj);
                strength += (pi + pj) * d * d;
            }
        }
        // IBSI 3.10: coarseness is set to 10^6 when Σ p_i s_i = 0; other ratios with a zero denominator are 0.
        r[0] = ps > 0 ? 1.0 / ps : 1e6;
        r[1] = ngp > 1 ? contrastSum / (ngp * (ngp - 1.0)) * sTotal / nvc : 0;
        r[2] = busyDen > 0 ? ps / busyDen : 0;
        r[3] = complexity / nvc;
        r[4] = sTotal > 0 ? strength / sTotal : 0;
    }
}
