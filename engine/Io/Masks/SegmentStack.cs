using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// One segment's frames as a regular stack: a grid whose rows and columns follow the frames' orientation and
/// pixel spacing and whose slices step along the normal (row × column) by the slice spacing; voxels hold
/// occupancy 0…255. Slices the SEG leaves out (empty frames are optional, PS3.3 C.8.20.2) stay 0.
/// The slice spacing is the first of Spacing Between Slices, Slice Thickness and the smallest gap between
/// frame planes on which every frame lies (within 5 % of a slice).
/// </summary>
internal static class SegmentStack
{
    public static Volume<byte>? Build(SegFrames seg, int segment, string where)
    {
        var idx = new List<int>();
        for (int f = 0; f < seg.Frames.Count; f++)
            if (seg.Frames[f].Segment == segment) idx.Add(f);
        if (idx.Count == 0) return null;
        var first = seg.Frames[idx[0]];
        foreach (int f in idx)
        {
            var fr = seg.Frames[f];
            if ((fr.Row - first.Row).Norm > 1e-4 || (fr.Column - first.Column).Norm > 1e-4
                || Math.Abs(fr.RowSpacingMm - first.RowSpacingMm) > 1e-4 || Math.Abs(fr.ColumnSpacingMm - first.ColumnSpacingMm) > 1e-4)
                throw new UnsupportedInputException($"the frames of segment {segment} differ in orientation or pixel spacing", where,
                    "one segment's frames must be parallel with equal pixel spacing");
        }
        var normal = first.Row.Cross(first.Column).Normalized();
        var d = idx.Select(f => seg.Frames[f].PositionMm.Dot(normal)).ToArray();
        double dMin = d.Min();
        double spacing = SliceSpacing(d, dMin, first, where, segment);
        var origin = seg.Frames[idx[Array.IndexOf(d, dMin)]].PositionMm;
        int slices = (int)Math.Round((d.Max() - dMin) / spacing) + 1;
        if ((long)seg.Rows * seg.Columns * slices > Limits.MaxVoxels)
            throw new InputLimitException($"segment {segment} spans {slices} slices of {seg.Columns}x{seg.Rows}", where);
        var grid = new Geometry(new Size3(seg.Columns, seg.Rows, slices), new Vec3(first.ColumnSpacingMm, first.RowSpacingMm, spacing),
            origin, Mat3.FromColumns(first.Row, first.Column, normal));
        var stack = new Volume<byte>(grid);
        double inPlaneTol = 0.05 * Math.Min(first.RowSpacingMm, first.ColumnSpacingMm);
        for (int n = 0; n < idx.Count; n++)
        {
            var fr = seg.Frames[idx[n]];
            int k = (int)Math.Round((d[n] - dMin) / spacing);
            if ((fr.PositionMm - (origin + (d[n] - dMin) * normal)).Norm > inPlaneTol)
                throw new UnsupportedInputException($"frame {idx[n] + 1} of segment {segment} is shifted within its plane against the others",
                    where, "the frames of one segment must share their row/column grid");
            var pixels = seg.Pixels(idx[n]);
            var dst = stack.Slice(k);
            for (int i = 0; i < dst.Length; i++) dst[i] = Math.Max(dst[i], pixels[i]);
        }
        return stack;
    }

    private static double SliceSpacing(double[] d, double dMin, SegFrame first, string where, int segment)
    {
        var distinct = d.Select(x => x - dMin).Order().ToList();
        double minGap = double.PositiveInfinity;
        for (int i = 1; i < distinct.Count; i++)
            if (distinct[i] - distinct[i - 1] > 1e-3) minGap = Math.Min(minGap, distinct[i] - distinct[i - 1]);
        if (double.IsPositiveInfinity(minGap)) return first.SpacingBetweenSlicesMm ?? first.SliceThicknessMm ?? Math.Min(first.RowSpacingMm, first.ColumnSpacingMm);
        foreach (var candidate in new[] { first.SpacingBetweenSlicesMm, first.SliceThicknessMm, minGap })
        {
            if (candidate is not double s || !(s > 1e-3)) continue;
            if (distinct.All(x => Math.Abs(x / s - Math.Round(x / s)) <= 0.05)) return s;
        }
        throw new UnsupportedInputException($"the frames of segment {segment} do not lie on regularly spaced planes", where,
            "resample the segmentation onto a regular grid");
    }
}
