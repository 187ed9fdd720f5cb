using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// Moran's I (IBSI 3.1.24, N365) and Geary's C (3.1.25, NPT7) over intensity-mask voxels with inverse
/// Euclidean distance weights (mm). The cost is quadratic, so above <c>maxVoxels</c> a regular,
/// deterministic subsample (every k-th voxel in index order) is used, as IBSI permits approximation.
/// NaN when the ROI has fewer than two voxels or constant intensity.
/// </summary>
internal static class SpatialAutocorrelation
{
    public static (double MoranI, double GearyC) Compute(RoiData roi, int maxVoxels)
    {
        int total = roi.RoiVoxelCount, stride = Math.Max(1, (int)Math.Ceiling(total / (double)Math.Max(2, maxVoxels)));
        int m = (total + stride - 1) / stride;
        var px = new double[m]; var py = new double[m]; var pz = new double[m]; var v = new double[m];
        int seen = 0, c = 0;
        for (int z = 0, n = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, n++)
        {
            if (roi.InRoi[n] == 0) continue;
            if (seen++ % stride != 0 || c >= m) continue;
            px[c] = x * roi.SpacingMm.X; py[c] = y * roi.SpacingMm.Y; pz[c] = z * roi.SpacingMm.Z; v[c] = roi.Intensity[n];
            c++;
        }
        if (c < 2) return (double.NaN, double.NaN);
        double mean = 0;
        for (int i = 0; i < c; i++) mean += v[i];
        mean /= c;
        double denom = 0;
        for (int i = 0; i < c; i++) denom += (v[i] - mean) * (v[i] - mean);
        if (denom == 0) return (double.NaN, double.NaN);
        double w = 0, moran = 0, geary = 0;
        for (int i = 0; i < c; i++)
        {
            double di = v[i] - mean;
            for (int j = i + 1; j < c; j++)
            {
                double dx = px[i] - px[j], dy = py[i] - py[j], dz = pz[i] - pz[j];
                double wij = 1.0 / Math.Sqrt(dx * dx + dy * dy + dz * dz);
                w += wij;
                moran += wij * di * (v[j] - mean);
                double dv = v[i] - v[j];
                geary += wij * dv * dv;
            }
        }
        // Sums over unordered pairs: each doubles for k ≠ l, and the factors of 2 cancel in both ratios except Geary's 2W.
        return (c / w * moran / denom, (c - 1) / (2 * w) * geary / denom);
    }
}
