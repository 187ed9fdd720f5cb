using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Masks;

/// <summary>One segment read from a SEG: number, label and its mask on the requested grid.</summary>
public sealed record SegmentMask(int Number, string Label, Volume<byte> Mask);

/// <summary>
/// Reads DICOM Segmentations (PS3.3 A.51, C.8.20): BINARY (1 bit per pixel, packed across frames, first pixel
/// in the least significant bit, PS3.5 8.1.1) and FRACTIONAL (8 bits, value / Maximum Fractional Value).
/// Frames are assigned to segments through Segment Identification (Referenced Segment Number) and placed in
/// space through Plane Position / Plane Orientation (Patient) and Pixel Measures, taken per frame or from the
/// shared functional groups (PS3.3 C.7.6.16); a frame without Plane Position is placed on the slice its
/// Derivation Image names, when the caller lists the target's slice instances. Each segment's frames form a
/// regular stack (<see cref="SegmentStack"/>) that is moved onto the target grid by <see cref="MaskTransfer"/>
/// (voxel for voxel when the grids share their planes, else partial volume ≥ 0.5; docs/masks.md).
/// </summary>
public static class SegmentationReader
{
    /// <summary>The segments of a SEG data set (Segment Sequence), in file order.</summary>
    public static IReadOnlyList<MaskItem> Segments(DicomDataset ds) =>
        [.. ds.GetSequence(DicomTags.SegmentSequence).Select(s => new MaskItem(s.GetInt(DicomTags.SegmentNumber),
            s.GetStringOrNull(DicomTags.SegmentLabel)?.Trim() ?? ""))];

    /// <summary>Reads every segment of <paramref name="path"/> onto <paramref name="grid"/>.</summary>
    public static IReadOnlyList<SegmentMask> Read(string path, Geometry grid)
    {
        ArgumentNullException.ThrowIfNull(grid);
        var file = DicomFile.Read(path);
        if (file.Dataset.GetStringOrNull(DicomTags.SOPClassUID)?.Trim('\0', ' ') != MaskSopClasses.Segmentation)
            throw new InputFormatException("the file is not a DICOM Segmentation", Path.GetFileName(path),
                $"give a SEG object (SOP Class {MaskSopClasses.Segmentation})");
        var frames = SegFrames.Read(file, Path.GetFileName(path), null);
        return [.. Segments(file.Dataset).OrderBy(s => s.Number)
            .Select(s => new SegmentMask(s.Number, s.Label, ToGrid(frames, s.Number, grid, [], Path.GetFileName(path))))];
    }

    /// <summary>Reads one segment (chosen by <see cref="MaskReadOptions.Item"/>) onto <paramref name="grid"/>.</summary>
    internal static MaskReadResult ReadOne(DicomFile file, string where, Geometry grid, MaskReadOptions options)
    {
        var item = MaskItems.Choose(Segments(file.Dataset), options.Item, "segment", where);
        MaskReferenceCheck.Check(file.Dataset, options.Reference, where);
        var frames = SegFrames.Read(file, where, options.Reference?.SliceInstanceUids is { } uids ? (uids, grid) : null);
        var notes = new List<string>();
        var mask = ToGrid(frames, item.Number, grid, notes, where);
        return new MaskReadResult(mask, MaskFormat.DicomSeg, item.ToString(), notes);
    }

    private static Volume<byte> ToGrid(SegFrames frames, int segment, Geometry grid, List<string> notes, string where)
    {
        var stack = SegmentStack.Build(frames, segment, where);
        if (stack is null)
        {
            notes.Add($"segment {segment} has no frame: empty mask");
            return new Volume<byte>(grid);
        }
        var mask = MaskTransfer.ToGrid(stack, grid, out bool aligned);
        if (!aligned) notes.Add($"segment {segment} lies on another grid ({stack.Geometry.Describe()}); resampled by partial volume ≥ 0.5");
        return mask;
    }
}
