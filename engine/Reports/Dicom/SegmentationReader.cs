using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>One segment read back from a SEG: number, label and its mask on the requested grid.</summary>
public sealed record SegmentMask(int Number, string Label, Volume<byte> Mask);

/// <summary>
/// Minimal reader of binary DICOM Segmentations whose frames lie on the planes of a given grid (same
/// orientation and in-plane grid; PS3.3 C.8.20): frames are mapped to segments through the Segment
/// Identification functional group and to slices through Plane Position (Patient). Bits are packed across
/// frames, first pixel in the least significant bit (PS3.5 8.1.1). Fractional SEGs and frames off the
/// grid's planes are refused with an <see cref="InputException"/>.
/// </summary>
public static class SegmentationReader
{
    /// <summary>Reads every segment of <paramref name="path"/> onto <paramref name="grid"/>.</summary>
    public static IReadOnlyList<SegmentMask> Read(string path, Geometry grid, double toleranceMm = 0.01)
    {
        ArgumentNullException.ThrowIfNull(grid);
        var file = DicomFile.Read(path);
        var ds = file.Dataset;
        string where = Path.GetFileName(path);
        if (ds.GetStringOrNull(DicomTags.SOPClassUID)?.Trim() != SegmentationWriter.SegmentationStorage)
            throw new InputFormatException("the file is not a DICOM Segmentation", where, "give a SEG object (SOP Class 1.2.840.10008.5.1.4.1.1.66.4)");
        if (ds.GetStringOrNull(DicomTags.SegmentationType)?.Trim() != "BINARY" || ds.GetInt(DicomTags.BitsAllocated) != 1)
            throw new UnsupportedInputException("only BINARY segmentations with 1 bit per pixel are read", where, "convert the SEG to BINARY");
        int rows = ds.GetInt(DicomTags.Rows), cols = ds.GetInt(DicomTags.Columns);
        if (rows != grid.Size.Y || cols != grid.Size.X)
            throw new GeometryMismatchException($"SEG frames are {cols}x{rows}, the grid is {grid.Size.X}x{grid.Size.Y}", where,
                "read the SEG onto the grid of the series it references");
        var segments = ds.GetSequence(DicomTags.SegmentSequence)
            .ToDictionary(s => s.GetInt(DicomTags.SegmentNumber), s => new SegmentMask(s.GetInt(DicomTags.SegmentNumber),
                s.GetStringOrNull(DicomTags.SegmentLabel) ?? "", new Volume<byte>(grid)));
        var shared = ds.GetSequence(DicomTags.SharedFunctionalGroupsSequence).FirstOrDefault();
        var perFrame = ds.GetSequence(DicomTags.PerFrameFunctionalGroupsSequence);
        int frames = ds.GetInt(DicomTags.NumberOfFrames);
        if (perFrame.Count != frames)
            throw new InputFormatException($"{perFrame.Count} per-frame functional group items for {frames} frames", where,
                "PS3.3 C.7.6.16: one item per frame");
        CheckOrientation(Group(shared, perFrame[0], DicomTags.PlaneOrientationSequence), grid, where);
        var bits = ds.Get(DicomTags.PixelData).Value.Span;
        int plane = rows * cols;
        if ((long)bits.Length * 8 < (long)plane * frames)
            throw new InputFormatException($"Pixel Data holds {bits.Length} bytes, {frames} frames of {cols}x{rows} bits need more", where);
        for (int f = 0; f < frames; f++)
        {
            int number = Group(shared, perFrame[f], DicomTags.SegmentIdentificationSequence).GetInt(DicomTags.ReferencedSegmentNumber);
            if (!segments.TryGetValue(number, out var seg))
                throw new InputFormatException($"frame {f + 1} names segment {number}, which the Segment Sequence lacks", where);
            int k = SliceOf(Group(shared, perFrame[f], DicomTags.PlanePositionSequence).GetDoubles(DicomTags.ImagePositionPatient), grid, toleranceMm, where, f);
            var dst = seg.Mask.Slice(k);
            long bit = (long)f * plane;
            for (int i = 0; i < plane; i++, bit++)
                if ((bits[(int)(bit >> 3)] & (1 << (int)(bit & 7))) != 0) dst[i] = 1;
        }
        return [.. segments.Values.OrderBy(s => s.Number)];
    }

    private static DicomDataset Group(DicomDataset? shared, DicomDataset frame, DicomTag sequence) =>
        frame.GetSequence(sequence).FirstOrDefault() ?? shared?.GetSequence(sequence).FirstOrDefault()
        ?? throw new InputFormatException($"functional group {sequence} {sequence.Keyword} is missing", "SEG");

    private static void CheckOrientation(DicomDataset group, Geometry grid, string where)
    {
        var o = group.GetDoubles(DicomTags.ImageOrientationPatient);
        var r = grid.Direction.Column(0);
        var c = grid.Direction.Column(1);
        double[] expected = [r.X, r.Y, r.Z, c.X, c.Y, c.Z];
        for (int i = 0; i < 6; i++)
            if (o.Length != 6 || Math.Abs(o[i] - expected[i]) > 1e-4)
                throw new GeometryMismatchException("SEG frame orientation differs from the grid's", where,
                    "this reader maps frames onto the planes of the referenced series only");
    }

    private static int SliceOf(double[] p, Geometry grid, double tol, string where, int frame)
    {
        var idx = grid.PhysicalToIndex(new Vec3(p[0], p[1], p[2]));
        int k = (int)Math.Round(idx.Z);
        var snapped = grid.IndexToPhysical(0, 0, k);
        if (k < 0 || k >= grid.Size.Z || (snapped - new Vec3(p[0], p[1], p[2])).Norm > tol)
            throw new GeometryMismatchException($"frame {frame + 1} at ({p[0]}, {p[1]}, {p[2]}) mm lies on no slice of the grid", where,
                "read the SEG onto the grid of the series it references");
        return k;
    }
}
