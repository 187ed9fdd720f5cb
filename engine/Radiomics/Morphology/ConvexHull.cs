namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// Convex hull of the mesh vertices by incremental insertion with exact integer orientation tests on the
/// doubled index coordinates (so no rounding can break the hull), then scaled to mm for volume and area.
/// Also returns the hull vertices (doubled index units): the maximum 3D diameter is attained between two of them.
/// </summary>
internal static class ConvexHull
{
    public static (double VolumeMm3, double AreaMm2, long[] Vertices) Measure(List<long> doubled, Core.Vec3 spacingMm)
    {
        var pts = Candidates(doubled);
        int n = pts.Length / 3;
        if (n < 4) return (double.NaN, double.NaN, pts);
        var faces = Initial(pts, n);
        if (faces is null) return (double.NaN, double.NaN, pts);
        var visibleEdges = new HashSet<long>();
        var next = new List<int>();
        var visible = new bool[64];
        for (int p = 0; p < n; p++)
        {
            int faceCount = faces.Count / 3;
            if (visible.Length < faceCount) visible = new bool[2 * faceCount];
            bool any = false;
            for (int f = 0; f < faceCount; f++)
            {
                visible[f] = Orient(pts, faces[3 * f], faces[3 * f + 1], faces[3 * f + 2], p) > 0;
                any |= visible[f];
            }
            if (!any) continue;
            visibleEdges.Clear();
            for (int f = 0; f < faceCount; f++)
            {
                if (!visible[f]) continue;
                int a = faces[3 * f], b = faces[3 * f + 1], c = faces[3 * f + 2];
                visibleEdges.Add(Key(a, b)); visibleEdges.Add(Key(b, c)); visibleEdges.Add(Key(c, a));
            }
            next.Clear();
            for (int f = 0; f < faceCount; f++)
            {
                int a = faces[3 * f], b = faces[3 * f + 1], c = faces[3 * f + 2];
                if (!visible[f]) { next.Add(a); next.Add(b); next.Add(c); continue; }
                // Horizon edges: edges of a visible face whose neighbour across the edge is not visible.
                if (!visibleEdges.Contains(Key(b, a))) { next.Add(a); next.Add(b); next.Add(p); }
                if (!visibleEdges.Contains(Key(c, b))) { next.Add(b); next.Add(c); next.Add(p); }
                if (!visibleEdges.Contains(Key(a, c))) { next.Add(c); next.Add(a); next.Add(p); }
            }
            (faces, next) = (next, faces);
        }
        var (volume, area) = Integrate(pts, faces, spacingMm);
        return (volume, area, HullVertices(pts, faces));
    }

    private static long[] HullVertices(long[] p, List<int> faces)
    {
        var used = new SortedSet<int>(faces);
        var result = new long[3 * used.Count];
        int k = 0;
        foreach (int i in used) { result[k++] = p[3 * i]; result[k++] = p[3 * i + 1]; result[k++] = p[3 * i + 2]; }
        return result;
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

    // A vertex of the 3D hull is also a vertex of the 2D hull of the points in its own x, y and z planes, so
    // points failing any of those three planar hulls are dropped before the (quadratic) 3D insertion.
    private static long[] Candidates(List<long> d)
    {
        int n = d.Count / 3;
        var keep = new bool[n];
        Array.Fill(keep, true);
        for (int axis = 0; axis < 3; axis++)
        {
            var order = new int[n];
            for (int i = 0; i < n; i++) order[i] = i;
            int u = (axis + 1) % 3, v = (axis + 2) % 3;
            Array.Sort(order, (a, b) =>
            {
                int c = d[3 * a + axis].CompareTo(d[3 * b + axis]);
                if (c != 0) return c;
                c = d[3 * a + u].CompareTo(d[3 * b + u]);
                return c != 0 ? c : d[3 * a + v].CompareTo(d[3 * b + v]);
            });
            var onHull = new bool[n];
            for (int start = 0; start < n;)
            {
                int end = start;
                while (end < n && d[3 * order[end] + axis] == d[3 * order[start] + axis]) end++;
                MarkPlanarHull(d, order.AsSpan(start, end - start), u, v, onHull);
                start = end;
            }
            for (int i = 0; i < n; i++) keep[i] &= onHull[i];
        }
        // Farthest from the centroid first: the hull then grows quickly and later points are mostly inside.
        double cx = 0, cy = 0, cz = 0;
        for (int i = 0; i < n; i++) { cx += d[3 * i]; cy += d[3 * i + 1]; cz += d[3 * i + 2]; }
        cx /= n; cy /= n; cz /= n;
        var kept = new List<int>();
        for (int i = 0; i < n; i++) if (keep[i]) kept.Add(i);
        var dist = kept.Select(i => -(Sq(d[3 * i] - cx) + Sq(d[3 * i + 1] - cy) + Sq(d[3 * i + 2] - cz))).ToArray();
        var idx = kept.ToArray();
        Array.Sort(dist, idx);
        var result = new long[3 * idx.Length];
        for (int t = 0; t < idx.Length; t++)
        {
            result[3 * t] = d[3 * idx[t]]; result[3 * t + 1] = d[3 * idx[t] + 1]; result[3 * t + 2] = d[3 * idx[t] + 2];
        }
        return result;
    }

    private static double Sq(double x) => x * x;

    // Andrew's monotone chain on points sorted by (u, v); collinear boundary points are kept (conservative).
    private static void MarkPlanarHull(List<long> d, ReadOnlySpan<int> sorted, int u, int v, bool[] onHull)
    {
        int m = sorted.Length;
        if (m <= 2) { foreach (int i in sorted) onHull[i] = true; return; }
        var chain = new int[2 * m];
        int k = 0;
        for (int pass = 0; pass < 2; pass++)
        {
            int floor = k;
            for (int t = 0; t < m; t++)
            {
                int p = pass == 0 ? sorted[t] : sorted[m - 1 - t];
                while (k >= floor + 2 && Cross(d, chain[k - 2], chain[k - 1], p, u, v) < 0) k--;
                chain[k++] = p;
            }
            k--;
        }
        for (int t = 0; t < k; t++) onHull[chain[t]] = true;
    }

    private static long Cross(List<long> d, int o, int a, int b, int u, int v) =>
        (d[3 * a + u] - d[3 * o + u]) * (d[3 * b + v] - d[3 * o + v]) - (d[3 * a + v] - d[3 * o + v]) * (d[3 * b + u] - d[3 * o + u]);
}
