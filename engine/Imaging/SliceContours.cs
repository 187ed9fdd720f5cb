namespace Serimetry.Engine.Imaging;

/// <summary>
/// Closed outlines of a binary slice by marching squares (common practice): the cells join four neighbouring
/// voxel centres (the slice padded by one outside voxel), a crossing sits at the midpoint of each cell edge whose
/// ends differ, and each cell joins its crossings so that the inside stays on one side. An ambiguous cell (two
/// diagonal inside corners) is cut at both inside corners (4-connected inside). Every inside centre then lies
/// strictly inside the outlines and every outside centre strictly outside, so filling the outlines by the
/// even-odd rule at voxel centres gives the slice back exactly. Straight runs are merged to their end points.
/// </summary>
internal static class SliceContours
{
    /// <summary>
    /// The closed outlines of the non-zero voxels of a <paramref name="width"/> × <paramref name="height"/> slice
    /// (x fastest), each as continuous-index coordinates x0, y0, x1, y1, … (not repeating the first point).
    /// </summary>
    public static List<double[]> Trace(ReadOnlySpan<byte> slice, int width, int height)
    {
        int w2 = width + 2, h2 = height + 2;
        var next = new int[2 * w2 * h2];
        Array.Fill(next, -1);
        bool In(ReadOnlySpan<byte> s, int i, int j) => i >= 0 && j >= 0 && i < width && j < height && s[i + width * j] != 0;
        Span<bool> corner = stackalloc bool[4];
        Span<int> edge = stackalloc int[4];
        for (int j = -1; j < height; j++)
            for (int i = -1; i < width; i++)
            {
                corner[0] = In(slice, i, j); corner[1] = In(slice, i + 1, j);
                corner[2] = In(slice, i + 1, j + 1); corner[3] = In(slice, i, j + 1);
                if (corner[0] == corner[1] && corner[1] == corner[2] && corner[2] == corner[3]) continue;
                int pi = i + 1, pj = j + 1;
                edge[0] = 2 * (pi + w2 * pj);             // a→b: horizontal edge at row j
                edge[1] = 2 * (pi + 1 + w2 * pj) + 1;     // b→c: vertical edge at column i+1
                edge[2] = 2 * (pi + w2 * (pj + 1));       // c→d: horizontal edge at row j+1
                edge[3] = 2 * (pi + w2 * pj) + 1;         // d→a: vertical edge at column i
                for (int k = 0; k < 4; k++)
                {
                    if (corner[k] || !corner[(k + 1) & 3]) continue; // not an entry (outside → inside)
                    for (int m = 1; m < 4; m++)
                    {
                        int e = (k + m) & 3;
                        if (corner[e] && !corner[(e + 1) & 3]) { next[edge[k]] = edge[e]; break; }
                    }
                }
            }
        return Loops(next, w2);
    }

    private static List<double[]> Loops(int[] next, int w2)
    {
        var loops = new List<double[]>();
        var points = new List<(double X, double Y)>();
        for (int start = 0; start < next.Length; start++)
        {
            if (next[start] < 0) continue;
            points.Clear();
            int id = start;
            while (next[id] >= 0)
            {
                int cell = id >> 1;
                double x = cell % w2 - 1, y = cell / w2 - 1;
                points.Add((id & 1) == 0 ? (x + 0.5, y) : (x, y + 0.5));
                int n = next[id];
                next[id] = -1;
                id = n;
            }
            loops.Add(Simplify(points));
        }
        return loops;
    }

    /// <summary>Drops points that lie on the straight line through their neighbours (exact on the half-voxel lattice).</summary>
    private static double[] Simplify(List<(double X, double Y)> p)
    {
        var kept = new List<(double X, double Y)>(p.Count);
        static bool Collinear((double X, double Y) a, (double X, double Y) b, (double X, double Y) c) =>
            (b.X - a.X) * (c.Y - a.Y) - (b.Y - a.Y) * (c.X - a.X) == 0;
        foreach (var q in p)
        {
            while (kept.Count >= 2 && Collinear(kept[^2], kept[^1], q)) kept.RemoveAt(kept.Count - 1);
            kept.Add(q);
        }
        while (kept.Count > 3 && Collinear(kept[^2], kept[^1], kept[0])) kept.RemoveAt(kept.Count - 1);
        while (kept.Count > 3 && Collinear(kept[^1], kept[0], kept[1])) kept.RemoveAt(0);
        var xy = new double[2 * kept.Count];
        for (int n = 0; n < kept.Count; n++) (xy[2 * n], xy[2 * n + 1]) = kept[n];
        return xy;
    }
}
