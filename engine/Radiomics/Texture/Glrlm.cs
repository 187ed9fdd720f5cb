using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// Grey level run length matrix (IBSI 3.7, family TP0I): r[i, j] counts runs of grey level i and length j
/// along a direction, a run ending at the ROI border. N_v for the run percentage is the number of voxels the
/// matrix covers (summed over merged matrices, IBSI 3.7.13).
/// </summary>
internal sealed class Glrlm(RoiData roi) : IDirectionalMatrix
{
    private readonly int _nr = Math.Max(roi.Nx, Math.Max(roi.Ny, roi.Nz));
    private readonly double[] _values = new double[CountMatrixFeatures.Count];

    public int Length => roi.BinCount * _nr;
    public int FeatureCount => 16;

    public void Accumulate(int slice, int dx, int dy, int dz, double[] m)
    {
        int z0 = slice < 0 ? 0 : slice, z1 = slice < 0 ? roi.Nz : slice + 1;
        var inRoi = roi.InRoi;
        var levels = roi.Levels;
        int step = dx + roi.Nx * (dy + roi.Ny * dz);
        for (int z = z0; z < z1; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++)
        {
            int n = roi.Index(x, y, z);
            if (inRoi[n] == 0) continue;
            int level = levels[n];
            if (Inside(x - dx, y - dy, z - dz) && inRoi[n - step] != 0 && levels[n - step] == level) continue;
            int length = 1, xx = x + dx, yy = y + dy, zz = z + dz, nn = n + step;
            while (Inside(xx, yy, zz) && inRoi[nn] != 0 && levels[nn] == level)
            {
                length++; xx += dx; yy += dy; zz += dz; nn += step;
            }
            m[(level - 1) * _nr + length - 1]++;
        }
    }

    public void Features(double[] m, Span<double> result)
    {
        double nv = 0;
        for (int i = 0; i < roi.BinCount; i++)
        for (int j = 0; j < _nr; j++) nv += (j + 1) * m[i * _nr + j];
        CountMatrixFeatures.Compute(m, roi.BinCount, _nr, nv, _values);
        _values.AsSpan(0, 16).CopyTo(result);
    }

    private bool Inside(int x, int y, int z) => (uint)x < (uint)roi.Nx && (uint)y < (uint)roi.Ny && (uint)z < (uint)roi.Nz;
}
