using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// Reads one ROI of a DICOM RT Structure Set (PS3.3 A.19; C.8.8.5 Structure Set, C.8.8.6 ROI Contour) and
/// rasterises its CLOSED_PLANAR contours (patient LPS mm) onto a target grid (docs/masks.md):
/// each contour must lie in a plane parallel to the target's slices (within 5 % of a slice); it goes to the
/// slice whose centre plane is nearest along the normal (at most half a slice away, so contours beyond the
/// first/last slice by more than half a slice are off the image); when several contour planes fall on one
/// slice only the nearest plane is used; the contours of that plane are filled together by the even-odd rule
/// (<see cref="ContourRasterizer"/>), so nested contours are holes. Other geometric types (POINT, OPEN_PLANAR,
/// OPEN_NONPLANAR) enclose nothing and are skipped with a note, as are self-intersecting contours' overlaps.
/// </summary>
public static class RtStructReader
{
    private const double PlaneTolerance = 0.05;

    /// <summary>The ROIs of a Structure Set (Structure Set ROI Sequence), in file order.</summary>
    public static IReadOnlyList<MaskItem> Rois(DicomDataset ds) =>
        [.. ds.GetSequence(DicomTags.StructureSetROISequence).Select(r => new MaskItem(r.GetInt(DicomTags.ROINumber),
            r.GetStringOrNull(DicomTags.ROIName)?.Trim() ?? ""))];

    internal static MaskReadResult ReadOne(DicomDataset ds, string where, Geometry grid, MaskReadOptions options)
    {
        var roi = MaskItems.Choose(Rois(ds), options.Item, "ROI", where);
        MaskReferenceCheck.Check(ds, options.Reference, where);
        var notes = new List<string>();
        var contours = Contours(ds, roi, where, notes);
        var planes = Planes(contours, grid, roi, where, notes);
        var mask = new Volume<byte>(grid);
        foreach (var (k, polygons) in planes)
            ContourRasterizer.FillEvenOdd(polygons, grid.Size.X, grid.Size.Y, mask.Slice(k));
        if (!mask.Voxels.AsSpan().ContainsAnyExcept((byte)0))
            throw new InputFormatException($"ROI {roi} covers no voxel centre of the image grid", where,
                "the contours lie off the image (or are too small for its voxels); check that the RTSTRUCT belongs to these images");
        return new MaskReadResult(mask, MaskFormat.RtStruct, roi.ToString(), notes);
    }

    /// <summary>The ROI's closed planar contours as arrays of LPS points (x, y, z, x, y, z, …).</summary>
    private static List<double[]> Contours(DicomDataset ds, MaskItem roi, string where, List<string> notes)
    {
        var item = ds.GetSequence(DicomTags.ROIContourSequence).FirstOrDefault(c => c.GetIntOrNull(DicomTags.ReferencedROINumber) == roi.Number)
            ?? throw new InputFormatException($"ROI {roi} has no item in the ROI Contour Sequence (3006,0039)", where,
                "PS3.3 C.8.8.6: every ROI has its contours there");
        var result = new List<double[]>();
        int skipped = 0;
        foreach (var c in item.GetSequence(DicomTags.ContourSequence))
        {
            string type = c.GetStringOrNull(DicomTags.ContourGeometricType)?.Trim() ?? "";
            var data = c.GetDoublesOrNull(DicomTags.ContourData) ?? [];
            int count = c.GetIntOrNull(DicomTags.NumberOfContourPoints) ?? data.Length / 3;
            if (data.Length != 3 * count)
                throw new InputFormatException($"ROI {roi}: a contour declares {count} points but holds {data.Length} coordinates", where,
                    "PS3.3 C.8.8.6.1: Contour Data holds x, y, z per point");
            if (type != "CLOSED_PLANAR" || count < 3) { skipped++; continue; }
            if (data.Any(v => !double.IsFinite(v)))
                throw new InputFormatException($"ROI {roi}: a contour holds a non-finite coordinate", where);
            result.Add(data);
        }
        if (skipped > 0) notes.Add($"ROI {roi}: {skipped} contour(s) skipped (not CLOSED_PLANAR or fewer than 3 points)");
        if (result.Count == 0)
            throw new InputFormatException($"ROI {roi} has no CLOSED_PLANAR contour", where, "give an ROI outlined by closed planar contours");
        return result;
    }

    /// <summary>Contours in target index coordinates (x, y pairs), grouped by target slice, nearest plane only.</summary>
    private static List<(int Slice, List<double[]> Polygons)> Planes(List<double[]> contours, Geometry grid, MaskItem roi, string where,
        List<string> notes)
    {
        var best = new Dictionary<int, (double Distance, double Z, List<double[]> Polygons)>();
        int off = 0, crossing = 0, partly = 0, farther = 0;
        foreach (var c in contours)
        {
            int n = c.Length / 3;
            var xy = new double[2 * n];
            double zMin = double.MaxValue, zMax = double.MinValue, zSum = 0;
            bool outside = false;
            for (int p = 0; p < n; p++)
            {
                var q = grid.PhysicalToIndex(new Vec3(c[3 * p], c[3 * p + 1], c[3 * p + 2]));
                xy[2 * p] = q.X;
                xy[2 * p + 1] = q.Y;
                zMin = Math.Min(zMin, q.Z); zMax = Math.Max(zMax, q.Z); zSum += q.Z;
                outside |= q.X < -0.5 || q.Y < -0.5 || q.X > grid.Size.X - 0.5 || q.Y > grid.Size.Y - 0.5;
            }
            if (zMax - zMin > 2 * PlaneTolerance)
                throw new UnsupportedInputException($"ROI {roi}: a contour is not parallel to the image slices (spans {(zMax - zMin) * grid.SpacingMm.Z:0.##} mm along their normal)",
                    where, "rasterising needs contours drawn on planes parallel to the target slices; resample the outline onto these images first");
            double z = zSum / n;
            int k = (int)Math.Floor(z + 0.5);
            if (k < 0 || k >= grid.Size.Z) { off++; continue; }
            if (outside) partly++;
            if (ContourRasterizer.SelfIntersects(xy) == true) crossing++;
            double distance = Math.Abs(z - k);
            if (!best.TryGetValue(k, out var cur) || distance < cur.Distance - PlaneTolerance)
            {
                if (best.ContainsKey(k)) farther += cur.Polygons.Count;
                best[k] = (distance, z, [xy]);
            }
            else if (Math.Abs(z - cur.Z) <= PlaneTolerance)
                cur.Polygons.Add(xy);
            else
                farther++;
        }
        if (best.Count == 0)
            throw new InputFormatException($"all {contours.Count} contours of ROI {roi} lie off the image slices", where,
                "check that the RTSTRUCT belongs to these images (same patient position and frame of reference)");
        string F(int v) => v.ToString(CultureInfo.InvariantCulture);
        if (off > 0) notes.Add($"ROI {roi}: {F(off)} contour(s) lie beyond the first or last slice and were left out");
        if (partly > 0) notes.Add($"ROI {roi}: {F(partly)} contour(s) reach outside the image and were clipped");
        if (farther > 0) notes.Add($"ROI {roi}: {F(farther)} contour(s) on planes farther from a slice centre than another plane of that slice were left out");
        if (crossing > 0) notes.Add($"ROI {roi}: {F(crossing)} contour(s) intersect themselves; filled by the even-odd rule");
        return [.. best.OrderBy(b => b.Key).Select(b => (b.Key, b.Value.Polygons))];
    }
}
