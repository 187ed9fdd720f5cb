namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// The 256 marching-cubes cases, derived here from the cube's faces rather than from a stored table: on
/// each face the crossed edges are joined by segments (on a face with two diagonal inside corners, each
/// inside corner is cut off separately, so neighbouring cubes always agree and the surface is closed);
/// segments are oriented so the surface normal points away from inside corners, then chained into loops.
/// Corner c sits at (c &amp; 1, (c &gt;&gt; 1) &amp; 1, (c &gt;&gt; 2) &amp; 1).
/// </summary>
internal static class CubeCases
{
    /// <summary>Edge e joins corner <see cref="EdgeCorner"/>[e] to that corner plus one step along <see cref="EdgeAxis"/>[e].</summary>
    public static readonly int[] EdgeCorner = new int[12];
    public static readonly int[] EdgeAxis = new int[12];

    /// <summary>For each case (bit c set = corner c inside), the loops as ordered edge lists.</summary>
    public static readonly int[][][] Loops = new int[256][][];

    static CubeCases()
    {
        int e = 0;
        for (int c = 0; c < 8; c++)
        for (int a = 0; a < 3; a++)
            if ((c & (1 << a)) == 0) { EdgeCorner[e] = c; EdgeAxis[e] = a; e++; }
        for (int config = 0; config < 256; config++) Loops[config] = BuildLoops(config);
    }

    private static int EdgeOf(int c1, int c2)
    {
        int lo = Math.Min(c1, c2), axis = System.Numerics.BitOperations.Log2((uint)(c1 ^ c2));
        for (int e = 0; e < 12; e++) if (EdgeCorner[e] == lo && EdgeAxis[e] == axis) return e;
        throw new InvalidOperationException("not a cube edge");
    }

    private static (double X, double Y, double Z) Corner(int c) => (c & 1, (c >> 1) & 1, (c >> 2) & 1);

    private static (double X, double Y, double Z) Mid(int e)
    {
        var p = Corner(EdgeCorner[e]);
        return EdgeAxis[e] switch { 0 => (p.X + 0.5, p.Y, p.Z), 1 => (p.X, p.Y + 0.5, p.Z), _ => (p.X, p.Y, p.Z + 0.5) };
    }

    private static int[][] BuildLoops(int config)
    {
        var next = new int[12];
        Array.Fill(next, -1);
        for (int axis = 0; axis < 3; axis++)
        for (int side = 0; side < 2; side++)
            AddFaceSegments(config, axis, side, next);
        var loops = new List<int[]>();
        var used = new bool[12];
        for (int start = 0; start < 12; start++)
        {
            if (next[start] < 0 || used[start]) continue;
            var loop = new List<int>();
            for (int cur = start; !used[cur]; cur = next[cur])
            {
                used[cur] = true;
                loop.Add(cur);
                if (next[cur] < 0) throw new InvalidOperationException($"open loop in cube case {config}");
            }
            loops.Add([.. loop]);
        }
        return [.. loops];
    }

    private static void AddFaceSegments(int config, int axis, int side, int[] next)
    {
        int u = (axis + 1) % 3, v = (axis + 2) % 3;
        // Face corners in cyclic order.
        var corners = new int[4];
        int[][] uv = [[0, 0], [1, 0], [1, 1], [0, 1]];
        for (int k = 0; k < 4; k++) corners[k] = (side << axis) | (uv[k][0] << u) | (uv[k][1] << v);
        bool In(int k) => (config & (1 << corners[k & 3])) != 0;
        var normal = (axis == 0 ? (side == 0 ? -1.0 : 1.0) : 0, axis == 1 ? (side == 0 ? -1.0 : 1.0) : 0, axis == 2 ? (side == 0 ? -1.0 : 1.0) : 0);
        int crossed = 0;
        for (int k = 0; k < 4; k++) if (In(k) != In(k + 1)) crossed++;
        if (crossed == 0) return;
        for (int k = 0; k < 4; k++)
        {
            if (!In(k)) continue;
            // The segment around inside corner k (or around a run of inside corners starting at k).
            if (crossed == 4 || !In(k - 1 + 4))
            {
                int end = k;
                while (crossed == 2 && In(end + 1)) end++;
                int ea = EdgeOf(corners[(k + 3) & 3], corners[k]), eb = EdgeOf(corners[end & 3], corners[(end + 1) & 3]);
                Orient(ea, eb, corners[k], normal, next);
            }
        }
    }

    private static void Orient(int ea, int eb, int insideCorner, (double X, double Y, double Z) n, int[] next)
    {
        var a = Mid(ea); var b = Mid(eb); var p = Corner(insideCorner);
        var t = (X: b.X - a.X, Y: b.Y - a.Y, Z: b.Z - a.Z);
        var w = (X: p.X - a.X, Y: p.Y - a.Y, Z: p.Z - a.Z);
        var nw = (X: n.Y * w.Z - n.Z * w.Y, Y: n.Z * w.X - n.X * w.Z, Z: n.X * w.Y - n.Y * w.X);
        bool forward = t.X * nw.X + t.Y * nw.Y + t.Z * nw.Z > 0;
        int from = forward ? ea : eb, to = forward ? eb : ea;
        if (next[from] >= 0) throw new InvalidOperationException("edge used twice");
        next[from] = to;
    }
}
