using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// The ROI surface by marching cubes on the zero-padded morphological mask at iso-level 0.5 (IBSI 3.1.1),
/// in millimetres along the index axes (spacing applied; the direction cosines, a rotation, change no
/// morphology feature). Loops longer than three edge points are fanned from the vertex giving the largest enclosed volume
/// (the convex fold a marching-cubes case table uses; it reproduces the IBSI phantom mesh values). Reports volume (divergence theorem), area and the unique
/// vertices (for diameters, bounding boxes and the convex hull), also in doubled index units for exact hull arithmetic.
/// </summary>
internal sealed class SurfaceMesh
{
    public double VolumeMm3 { get; private set; }
    public double AreaMm2 { get; private set; }

    /// <summary>Unique vertices as doubled index coordinates (integers), x, y, z interleaved.</summary>
    public List<long> DoubledVertices { get; } = [];

    public static SurfaceMesh Build(RoiData roi)
    {
        var mesh = new SurfaceMesh();
        mesh.March(roi);
        return mesh;
    }

    private void March(RoiData roi)
    {
        int nx = roi.Nx, ny = roi.Ny, nz = roi.Nz;
        double sx = roi.SpacingMm.X, sy = roi.SpacingMm.Y, sz = roi.SpacingMm.Z;
        var seen = new HashSet<long>();
        Span<double> px = stackalloc double[12], py = stackalloc double[12], pz = stackalloc double[12];
        double volume6 = 0, area2 = 0;
        for (int z = -1; z < nz; z++)
        for (int y = -1; y < ny; y++)
        for (int x = -1; x < nx; x++)
        {
            int config = 0;
            for (int c = 0; c < 8; c++)
                if (Inside(roi, x + (c & 1), y + ((c >> 1) & 1), z + ((c >> 2) & 1))) config |= 1 << c;
            if (config == 0 || config == 255) continue;
            foreach (var loop in CubeCases.Loops[config])
            {
                for (int k = 0; k < loop.Length; k++)
                {
                    int e = loop[k], c = CubeCases.EdgeCorner[e], a = CubeCases.EdgeAxis[e];
                    long dx = 2L * (x + (c & 1)) + (a == 0 ? 1 : 0);
                    long dy = 2L * (y + ((c >> 1) & 1)) + (a == 1 ? 1 : 0);
                    long dz = 2L * (z + ((c >> 2) & 1)) + (a == 2 ? 1 : 0);
                    px[k] = 0.5 * dx * sx; py[k] = 0.5 * dy * sy; pz[k] = 0.5 * dz * sz;
                    long key = ((dz + 2) * (2L * ny + 4) + (dy + 2)) * (2L * nx + 4) + (dx + 2);
                    if (seen.Add(key)) { DoubledVertices.Add(dx); DoubledVertices.Add(dy); DoubledVertices.Add(dz); }
                }
                AddLoop(px[..loop.Length], py[..loop.Length], pz[..loop.Length], ref volume6, ref area2);
            }
        }
        VolumeMm3 = volume6 / 6.0;
        AreaMm2 = area2 / 2.0;
    }

    private static void AddLoop(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> z, ref double volume6, ref double area2)
    {
        int n = x.Length;
        // Of the fans from each loop vertex, take the one enclosing the most volume, breaking ties by the smaller
        // area; the choice then does not depend on where the loop starts (differences are origin-independent).
        int best = 0;
        double bestArea = double.MaxValue, bestVolume = double.MinValue;
        for (int s = 0; s < (n == 3 ? 1 : n); s++)
        {
            double v = 0, a = 0;
            Fan(x, y, z, s, ref v, ref a);
            bool larger = v > bestVolume + 1e-9 * Math.Max(1, Math.Abs(v));
            bool tie = !larger && v >= bestVolume - 1e-9 * Math.Max(1, Math.Abs(v));
            if (larger || (tie && a < bestArea - 1e-9 * Math.Max(1, a)))
            {
                best = s; bestArea = a; bestVolume = v;
            }
        }
        Fan(x, y, z, best, ref volume6, ref area2);
    }

    private static void Fan(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> z, int s, ref double volume6, ref double area2)
    {
        int n = x.Length;
        for (int k = 1; k < n - 1; k++)
        {
            int b = (s + k) % n, c = (s + k + 1) % n;
            AddTriangle(x[s], y[s], z[s], x[b], y[b], z[b], x[c], y[c], z[c], ref volume6, ref area2);
        }
    }

    private static void AddTriangle(double ax, double ay, double az, double bx, double by, double bz,
        double cx, double cy, double cz, ref double volume6, ref double area2)
    {
        // Signed volume of the tetrahedron with the origin, and twice the triangle area.
        volume6 += ax * (by * cz - bz * cy) - ay * (bx * cz - bz * cx) + az * (bx * cy - by * cx);
        double ux = bx - ax, uy = by - ay, uz = bz - az, vx = cx - ax, vy = cy - ay, vz = cz - az;
        double nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
        area2 += Math.Sqrt(nx * nx + ny * ny + nz * nz);
    }

    private static bool Inside(RoiData roi, int x, int y, int z) =>
        (uint)x < (uint)roi.Nx && (uint)y < (uint)roi.Ny && (uint)z < (uint)roi.Nz && roi.Morph[roi.Index(x, y, z)] != 0;
}
