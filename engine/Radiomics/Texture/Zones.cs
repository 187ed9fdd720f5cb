using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// Zones for GLSZM/GLDZM: connected groups of intensity-mask voxels sharing a grey level, linked by
/// Chebyshev distance 1 (8-connected within a slice for 2D, 26-connected for 3D; IBSI 3.8). Each zone
/// records its level, size and its distance to the ROI border: the smallest over its voxels of the
/// Manhattan distance to the nearest voxel outside the morphological mask (border voxels have distance 1; IBSI 3.9).
/// </summary>
internal sealed class Zones
{
    private readonly RoiData _roi;
    private readonly int[] _label;
    private readonly int[] _stack;
    private int _stamp;

    public Zones(RoiData roi)
    {
        _roi = roi;
        _label = new int[roi.Count];
        _stack = new int[roi.Count];
        Distance3D = CityBlock(roi, inPlane: false);
        Distance2D = CityBlock(roi, inPlane: true);
    }

    public int[] Distance3D { get; }
    public int[] Distance2D { get; }

    /// <summary>Calls <paramref name="onZone"/>(level, size, distance) for every zone of a slice (or the volume when −1).</summary>
    public void ForEach(int slice, Action<int, int, int> onZone)
    {
        var roi = _roi;
        bool is2D = slice >= 0;
        var dist = is2D ? Distance2D : Distance3D;
        int z0 = is2D ? slice : 0, z1 = is2D ? slice + 1 : roi.Nz;
        int stamp = ++_stamp;
        for (int z = z0; z < z1; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++)
        {
            int seed = roi.Index(x, y, z);
            if (roi.InRoi[seed] == 0 || _label[seed] == stamp) continue;
            int level = roi.Levels[seed];
            _label[seed] = stamp;
            int top = 0, size = 0, minDist = int.MaxValue;
            _stack[top++] = seed;
            while (top > 0)
            {
                int n = _stack[--top];
                size++;
                if (dist[n] < minDist) minDist = dist[n];
                int cz = n / (roi.Nx * roi.Ny), rem = n - cz * roi.Nx * roi.Ny, cy = rem / roi.Nx, cx = rem - cy * roi.Nx;
                int dzLo = is2D ? 0 : -1, dzHi = is2D ? 0 : 1;
                for (int dz = dzLo; dz <= dzHi; dz++)
                for (int dy = -1; dy <= 1; dy++)
                for (int dx = -1; dx <= 1; dx++)
                {
                    int xx = cx + dx, yy = cy + dy, zz = cz + dz;
                    if ((uint)xx >= (uint)roi.Nx || (uint)yy >= (uint)roi.Ny || (uint)zz >= (uint)roi.Nz) continue;
                    int nn = roi.Index(xx, yy, zz);
                    if (_label[nn] == stamp || roi.InRoi[nn] == 0 || roi.Levels[nn] != level) continue;
                    _label[nn] = stamp;
                    _stack[top++] = nn;
                }
            }
            onZone(level, size, minDist);
        }
    }

    // Exact city-block distance transform by two raster passes; voxels beyond the crop count as outside.
    private static int[] CityBlock(RoiData roi, bool inPlane)
    {
        int nx = roi.Nx, ny = roi.Ny, nz = roi.Nz, plane = nx * ny;
        var d = new int[roi.Count];
        for (int n = 0; n < d.Length; n++) d[n] = roi.Morph[n] != 0 ? int.MaxValue / 2 : 0;
        for (int z = 0, n = 0; z < nz; z++)
        for (int y = 0; y < ny; y++)
        for (int x = 0; x < nx; x++, n++)
        {
            if (d[n] == 0) continue;
            int v = d[n];
            v = Math.Min(v, (x > 0 ? d[n - 1] : 0) + 1);
            v = Math.Min(v, (y > 0 ? d[n - nx] : 0) + 1);
            if (!inPlane) v = Math.Min(v, (z > 0 ? d[n - plane] : 0) + 1);
            d[n] = v;
        }
        for (int z = nz - 1, n = d.Length - 1; z >= 0; z--)
        for (int y = ny - 1; y >= 0; y--)
        for (int x = nx - 1; x >= 0; x--, n--)
        {
            if (d[n] == 0) continue;
            int v = d[n];
            v = Math.Min(v, (x < nx - 1 ? d[n + 1] : 0) + 1);
            v = Math.Min(v, (y < ny - 1 ? d[n + nx] : 0) + 1);
            if (!inPlane) v = Math.Min(v, (z < nz - 1 ? d[n + plane] : 0) + 1);
            d[n] = v;
        }
        return d;
    }
}
