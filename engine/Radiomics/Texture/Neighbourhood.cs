using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// The Chebyshev-distance-δ neighbourhood of a voxel without the voxel itself: a (2δ+1)² square in the
/// slice for 2D, a (2δ+1)³ cube for 3D (IBSI 3.10, 3.11). Calls back for each in-ROI neighbour's level.
/// </summary>
internal sealed class Neighbourhood
{
    private readonly int[] _dx, _dy, _dz;

    public Neighbourhood(int distance, bool is2D)
    {
        if (distance < 1 || distance > 10)
            throw new Core.InvalidParameterException($"neighbourhood distance {distance} must be 1..10", "texture.neighbourhoodDistance");
        List<int> dx = [], dy = [], dz = [];
        int zr = is2D ? 0 : distance;
        for (int k = -zr; k <= zr; k++)
        for (int j = -distance; j <= distance; j++)
        for (int i = -distance; i <= distance; i++)
        {
            if (i == 0 && j == 0 && k == 0) continue;
            dx.Add(i); dy.Add(j); dz.Add(k);
        }
        (_dx, _dy, _dz) = ([.. dx], [.. dy], [.. dz]);
    }

    public int Size => _dx.Length;

    /// <summary>Sum and count of the levels of in-ROI neighbours, and how many are within α of <paramref name="level"/>.</summary>
    public (double Sum, int Count, int Similar) Scan(RoiData roi, int x, int y, int z, int level, int alpha)
    {
        double sum = 0; int count = 0, similar = 0;
        for (int o = 0; o < _dx.Length; o++)
        {
            int xx = x + _dx[o], yy = y + _dy[o], zz = z + _dz[o];
            if ((uint)xx >= (uint)roi.Nx || (uint)yy >= (uint)roi.Ny || (uint)zz >= (uint)roi.Nz) continue;
            int nn = roi.Index(xx, yy, zz);
            if (roi.InRoi[nn] == 0) continue;
            int l = roi.Levels[nn];
            sum += l; count++;
            if (Math.Abs(l - level) <= alpha) similar++;
        }
        return (sum, count, similar);
    }
}
