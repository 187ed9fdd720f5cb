namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// Convex hull of the mesh vertices by incremental insertion with exact integer orientation tests on the
/// doubled index coordinates (so no rounding can break the hull), then scaled to mm for volume and area.
/// Points not extreme along their x, y and z grid lines are dropped first: they cannot be hull vertices.
/// </summary>
internal static class ConvexHull
{
    public static (double VolumeMm3, double AreaMm2) Measure(List<long> doubled, Core.Vec3 spacingMm)
    {
        var pts = Candidates(doubled);
        int n = pts.Length / 3;
        if (n < 4) return (double.NaN, double.NaN);
        var faces = Initial(pts, n);
        if (faces is null) return (double.NaN, double.NaN);
        var visibleEdges = new HashSet<long>();
        var next = new List<int>();
        for (int p = 0; p < n; p++)
        {
            visibleEdges.Clear();
            bool any = false;
            for (int f = 0; f < faces.Count; f += 3)
            {
                if (Orient(pts, faces[f], faces[f + 1], faces[f + 2], p) <= 0) continue;
                any = true;
                visibleEdges.Add(Key(faces[f], faces[f + 1])); visibleEdges.Add(Key(faces[f + 1], faces[f + 2])); visibleEdges.Add(Key(faces[f + 2], faces[f]));
            }
            if (!any) continue;
            next.Clear();
            for (int f = 0; f < faces.Count; f += 3)
            {
                int a = faces[f], b = faces[f + 1], c = faces[f + 2];
                if (Orient(pts, a, b, c, p) <= 0) { next.Add(a); next.Add(b); next.Add(c); continue; }
                // Horizon edges: edges of a visible face whose neighbour across the edge is not visible.
                if (!visibleEdges.Contains(Key(b, a))) { next.Add(a); next.Add(b); next.Add(p); }
                if (!visibleEdges.Contains(Key(c, b))) { next.Add(b); next.Add(c); next.Add(p); }
                if (!visibleEdges.Contains(Key(a, c))) { next.Add(c); next.Add(a); next.Add(p); }
            }
            (faces, next) = (next, faces);
        }
        return Integrate(pts, faces, spacingMm);
    }

    private static long Key(int a, int b) => ((long)a << 32) | (uint)b;

    private static long Orient(long[] p, int a, int b, int c, int d)
    {
        long ax = p[3 * a], ay = p[3 * a + 1], az = p[3 * a + 2];
        long bx = p[3 * b] - ax, by = p[3 * b + 1] - ay, bz = p[3 * b + 2] - az;
        long cx = p[3 * c] - ax, cy = p[3 * c + 1] - ay, cz = p[3 * c + 2] - az;
        long dx = p[3 * d] - ax, dy = p[3 * d + 1] - ay, dz = p[3 * d + 2] - az;
        return bx * (cy * dz - cz * dy) - by * (cx * dz - cz * dx) + bz * (cx * dy - cy * dx);
    }

    // A first tetrahedron with outward-facing triangles (positive orientation = point outside the face).
    private static List<int>? Initial(long[] p, int n)
    {
        int i1 = -1, i2 = -1, i3 = -1;
        for (int i = 1; i < n && i1 < 0; i++)
            if (p[3 * i] != p[0] || p[3 * i + 1] != p[1] || p[3 * i + 2] != p[2]) i1 = i;
        if (i1 < 0) return null;
        for (int i = 1; i < n && i2 < 0; i++)
        {
            long ux = p[3 * i1] - p[0], uy = p[3 * i1 + 1] - p[1], uz = p[3 * i1 + 2] - p[2];
            long vx = p[3 * i] - p[0], vy = p[3 * i + 1] - p[1], vz = p[3 * i + 2] - p[2];
            if (uy * vz - uz * vy != 0 || uz * vx - ux * vz != 0 || ux * vy - uy * vx != 0) i2 = i;
        }
        if (i2 < 0) return null;
        for (int i = 1; i < n && i3 < 0; i++)
            if (Orient(p, 0, i1, i2, i) != 0) i3 = i;
        if (i3 < 0) return null;
        int a = 0, b = i1, c = i2;
        if (Orient(p, a, b, c, i3) > 0) (b, c) = (c, b);
        return [a, b, c, a, i3, b, b, i3, c, c, i3, a];
    }

    private static (double, double) Integrate(long[] p, List<int> faces, Core.Vec3 s)
    {
        double volume6 = 0, area2 = 0;
        for (int f = 0; f < faces.Count; f += 3)
        {
            double ax = 0.5 * s.X * p[3 * faces[f]], ay = 0.5 * s.Y * p[3 * faces[f] + 1], az = 0.5 * s.Z * p[3 * faces[f] + 2];
            double bx = 0.5 * s.X * p[3 * faces[f + 1]] - ax, by = 0.5 * s.Y * p[3 * faces[f + 1] + 1] - ay, bz = 0.5 * s.Z * p[3 * faces[f + 1] + 2] - az;
            double cx = 0.5 * s.X * p[3 * faces[f + 2]] - ax, cy = 0.5 * s.Y * p[3 * faces[f + 2] + 1] - ay, cz = 0.5 * s.Z * p[3 * faces[f + 2] + 2] - az;
            double nx = by * cz - bz * cy, ny = bz * cx - bx * cz, nz = bx * cy - by * cx;
            area2 += Math.Sqrt(nx * nx + ny * ny + nz * nz);
            volume6 += ax * nx + ay * ny + az * nz;
        }
        return (volume6 / 6.0, area2 / 2.0);
    }

    // Keep only points that are the lowest or highest on each of their three axis-parallel grid lines.
    private static long[] Candidates(List<long> d)
    {
        int n = d.Count / 3;
        var keep = new bool[n];
        Array.Fill(keep, true);
        for (int axis = 0; axis < 3; axis++)
        {
            var lo = new Dictionary<(long, long), long>();
            var hi = new Dictionary<(long, long), long>();
            for (int i = 0; i < n; i++)
            {
                var line = (d[3 * i + (axis + 1) % 3], d[3 * i + (axis + 2) % 3]);
                long v = d[3 * i + axis];
                lo[line] = lo.TryGetValue(line, out long l) ? Math.Min(l, v) : v;
                hi[line] = hi.TryGetValue(line, out long h) ? Math.Max(h, v) : v;
            }
            for (int i = 0; i < n; i++)
            {
                var line = (d[3 * i + (axis + 1) % 3], d[3 * i + (axis + 2) % 3]);
                long v = d[3 * i + axis];
                if (v != lo[line] && v != hi[line]) keep[i] = false;
            }
        }
        var result = new List<long>();
        for (int i = 0; i < n; i++)
            if (keep[i]) { result.Add(d[3 * i]); result.Add(d[3 * i + 1]); result.Add(d[3 * i + 2]); }
        return [.. result];
    }
}
