using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// Neighbouring grey level dependence matrix (IBSI 3.11, family REK0): s[i, j] counts voxels of level i
/// with dependence j = 1 + the number of in-ROI neighbours (Chebyshev δ) whose level differs by at most α.
/// </summary>
internal sealed class Ngldm : IRegionMatrix
{
    private readonly RoiData _roi;
    private readonly int _alpha;
    private readonly Neighbourhood _n2, _n3;
    private readonly int _nj;

    public Ngldm(RoiData roi, int distance, int alpha)
    {
        if (alpha < 0)
            throw new Core.InvalidParameterException($"NGLDM coarseness α = {alpha} must be ≥ 0", "texture.ngldmCoarseness");
        _roi = roi;
        _alpha = alpha;
        _n2 = new Neighbourhood(distance, is2D: true);
        _n3 = new Neighbourhood(distance, is2D: false);
        _nj = _n3.Size + 1;
    }

    public int Length => _roi.BinCount * _nj;
    public int FeatureCount => CountMatrixFeatures.Count;

    public double Accumulate(int slice, double[] m)
    {
        var roi = _roi;
        var nb = slice >= 0 ? _n2 : _n3;
        int z0 = slice < 0 ? 0 : slice, z1 = slice < 0 ? roi.Nz : slice + 1;
        double voxels = 0;
        for (int z = z0; z < z1; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++)
        {
            int n = roi.Index(x, y, z);
            if (roi.InRoi[n] == 0) continue;
            int level = roi.Levels[n];
            var (_, _, similar) = nb.Scan(roi, x, y, z, level, _alpha);
            m[(level - 1) * _nj + similar]++;
            voxels++;
        }
        return voxels;
    }

    public void Features(double[] m, double voxelCount, Span<double> result) =>
        CountMatrixFeatures.Compute(m, _roi.BinCount, _nj, voxelCount, result);
}
