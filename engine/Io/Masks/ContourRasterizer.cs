namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// Fills closed polygons on one slice of a grid (docs/masks.md). Coordinates are continuous voxel indices
/// (x along columns, y along rows; voxel centres at integers). A voxel is inside when its centre is inside by
/// the even-odd rule over all polygons of the slice together: nested contours make holes, and the lobes of a
/// self-intersecting contour that are wound twice are left out. Crossings are counted with the half-open rule
/// (an edge counts for a scanline y when exactly one end has y' ≤ y), and a centre counts as inside when an odd
/// number of crossings lie strictly left of it — so a centre exactly on a left edge is out, on a right edge in.
/// </summary>
internal static class ContourRasterizer
{
    /// <summary>Sets <paramref name="slice"/>[x + width·y] = 1 inside the polygons (each polygon: x0, y0, x1, y1, …).</summary>
    public static void FillEvenOdd(IReadOnlyList<double[]> polygons, int width, int height, Span<byte> slice)
    {
        double yMin = double.MaxValue, yMax = double.MinValue;
        foreach (var p in polygons)
            for (int n = 1; n < p.Length; n += 2)
            {
                yMin = Math.Min(yMin, p[n]);
                yMax = Math.Max(yMax, p[n]);
            }
        int j0 = (int)Math.Clamp(Math.Ceiling(yMin), 0, height), j1 = (int)Math.Clamp(Math.Floor(yMax), -1, height - 1);
        var crossings = new List<double>();
        for (int j = j0; j <= j1; j++)
        {
            crossings.Clear();
            foreach (var p in polygons) AddCrossings(p, j, crossings);
            crossings.Sort();
            var row = slice.Slice(j * width, width);
            for (int c = 0; c + 1 < crossings.Count; c += 2)
            {
                // i inside ⇔ x_{2m} < i ≤ x_{2m+1}
                int from = (int)Math.Clamp(Math.Floor(crossings[c]) + 1, 0, width);
                int to = (int)Math.Clamp(Math.Floor(crossings[c + 1]), -1, width - 1);
                if (from <= to) row[from..(to + 1)].Fill(1);
            }
        }
    }

    private static void AddCrossings(double[] p, double y, List<double> crossings)
    {
        int n = p.Length / 2;
        for (int a = 0, b = n - 1; a < n; b = a++)
        {
            double ya = p[2 * a + 1], yb = p[2 * b + 1];
            if (ya <= y == yb <= y) continue;
            double xa = p[2 * a], xb = p[2 * b];
            crossings.Add(xa + (y - ya) * (xb - xa) / (yb - ya));
        }
    }

    /// <summary>
    /// True when two non-adjacent edges of the closed polygon cross or touch (a figure-eight, a loop drawn
    /// twice). O(n²) with a bounding-box test; polygons above <paramref name="maxPoints"/> points are not checked (null).
    /// </summary>
    public static bool? SelfIntersects(double[] p, int maxPoints = 5000)
    {
        int n = p.Length / 2;
        if (n > maxPoints) return null;
        for (int a = 0; a < n; a++)
        {
            int a2 = (a + 1) % n;
            for (int b = a + 2; b < n; b++)
            {
                int b2 = (b + 1) % n;
                if (b2 == a) continue; // adjacent through the closing edge
                if (SegmentsMeet(p[2 * a], p[2 * a + 1], p[2 * a2], p[2 * a2 + 1], p[2 * b], p[2 * b + 1], p[2 * b2], p[2 * b2 + 1]))
                    return true;
            }
        }
        return false;
    }

    private static bool SegmentsMeet(double ax, double ay, double bx, double by, double cx, double cy, double dx, double dy)
    {
        if (Math.Max(ax, bx) < Math.Min(cx, dx) || Math.Max(cx, dx) < Math.Min(ax, bx)
            || Math.Max(ay, by) < Math.Min(cy, dy) || Math.Max(cy, dy) < Math.Min(ay, by)) return false;
        double d1 = Orient(cx, cy, dx, dy, ax, ay), d2 = Orient(cx, cy, dx, dy, bx, by);
        double d3 = Orient(ax, ay, bx, by, cx, cy), d4 = Orient(ax, ay, bx, by, dx, dy);
        if ((d1 > 0 && d2 < 0 || d1 < 0 && d2 > 0) && (d3 > 0 && d4 < 0 || d3 < 0 && d4 > 0)) return true;
        return d1 == 0 && OnSegment(cx, cy, dx, dy, ax, ay) || d2 == 0 && OnSegment(cx, cy, dx, dy, bx, by)
            || d3 == 0 && OnSegment(ax, ay, bx, by, cx, cy) || d4 == 0 && OnSegment(ax, ay, bx, by, dx, dy);
    }

    private static double Orient(double ax, double ay, double bx, double by, double cx, double cy) =>
        (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);

    private static bool OnSegment(double ax, double ay, double bx, double by, double px, double py) =>
        px >= Math.Min(ax, bx) && px <= Math.Max(ax, bx) && py >= Math.Min(ay, by) && py <= Math.Max(ay, by);
}
