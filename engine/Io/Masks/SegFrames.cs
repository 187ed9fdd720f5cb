using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// The frames of a SEG with the per-frame facts needed to place them: segment number, plane position and
/// orientation, pixel spacing and slice spacing (PS3.3 C.7.6.16.2.1, .2.3, .2.4, C.8.20.3.1), and the
/// decoded pixels as occupancy 0…255 (BINARY 1 → 255; FRACTIONAL v → round(255·v / Maximum Fractional Value)).
/// </summary>
internal sealed class SegFrames
{
    public required int Rows { get; init; }
    public required int Columns { get; init; }
    public required IReadOnlyList<SegFrame> Frames { get; init; }

    /// <summary>Occupancy of one frame, row by row (Columns fastest).</summary>
    public required Func<int, byte[]> Pixels { get; init; }

    public static SegFrames Read(DicomFile file, string where, (IReadOnlyList<string> Uids, Geometry Grid)? slices)
    {
        var ds = file.Dataset;
        string type = ds.GetStringOrNull(DicomTags.SegmentationType)?.Trim() ?? "";
        int bits = ds.GetIntOrNull(DicomTags.BitsAllocated) ?? 0;
        int max = 1;
        if (type == "BINARY" && bits != 1 || type == "FRACTIONAL" && bits != 8)
            throw new InputFormatException($"Segmentation Type {type} with Bits Allocated {bits}", where,
                "PS3.3 C.8.20.2: BINARY needs 1 bit, FRACTIONAL 8 bits per pixel");
        if (type == "FRACTIONAL")
        {
            max = ds.GetIntOrNull(DicomTags.MaximumFractionalValue) ?? 0;
            if (max is < 1 or > 255)
                throw new InputFormatException($"Maximum Fractional Value (0062,000E) is {max}", where, "PS3.3 C.8.20.2: 1 to 255");
        }
        else if (type != "BINARY")
            throw new UnsupportedInputException($"Segmentation Type '{type}' is not read", where, "give a BINARY or FRACTIONAL SEG");
        int rows = ds.GetInt(DicomTags.Rows), cols = ds.GetInt(DicomTags.Columns);
        int count = ds.GetIntOrNull(DicomTags.NumberOfFrames) ?? 1;
        var perFrame = ds.GetSequence(DicomTags.PerFrameFunctionalGroupsSequence);
        if (perFrame.Count != count)
            throw new InputFormatException($"{perFrame.Count} per-frame functional group items for {count} frames", where,
                "PS3.3 C.7.6.16: one item per frame");
        var frames = new SegFrame[count];
        for (int f = 0; f < count; f++) frames[f] = SegFrame.Read(ds, f, where, slices);
        var pixels = file.GetPixelData();
        if (pixels.FrameCount < count)
            throw new InputFormatException($"Pixel Data holds {pixels.FrameCount} frames, {count} are declared", where);
        int plane = rows * cols;
        byte[] Decode(int f)
        {
            var raw = pixels.GetFrameBytes(f);
            var occ = new byte[plane];
            if (bits == 1)
            {
                if (raw.Length * 8L < plane) throw new InputFormatException($"frame {f + 1} is truncated", where);
                for (int i = 0; i < plane; i++) occ[i] = (raw[i >> 3] & (1 << (i & 7))) != 0 ? (byte)255 : (byte)0;
            }
            else
            {
                if (raw.Length < plane) throw new InputFormatException($"frame {f + 1} is truncated", where);
                for (int i = 0; i < plane; i++) occ[i] = (byte)Math.Round(255.0 * Math.Min(raw[i], max) / max);
            }
            return occ;
        }
        return new SegFrames { Rows = rows, Columns = cols, Frames = frames, Pixels = Decode };
    }
}

/// <summary>One SEG frame's placement (LPS mm) and segment.</summary>
internal sealed record SegFrame(int Segment, Vec3 PositionMm, Vec3 Row, Vec3 Column, double RowSpacingMm, double ColumnSpacingMm,
    double? SpacingBetweenSlicesMm, double? SliceThicknessMm)
{
    public static SegFrame Read(DicomDataset ds, int f, string where, (IReadOnlyList<string> Uids, Geometry Grid)? slices)
    {
        int segment = Find(ds, DicomTags.ReferencedSegmentNumber, f)?.Holder.GetInt(DicomTags.ReferencedSegmentNumber)
            ?? throw new InputFormatException($"frame {f + 1} has no Referenced Segment Number (Segment Identification)", where,
                "PS3.3 C.8.20.3.1: every frame names its segment");
        var iop = Find(ds, DicomTags.ImageOrientationPatient, f)?.Holder.GetDoubles(DicomTags.ImageOrientationPatient);
        var ipp = Find(ds, DicomTags.ImagePositionPatient, f)?.Holder.GetDoubles(DicomTags.ImagePositionPatient);
        var ps = Find(ds, DicomTags.PixelSpacing, f)?.Holder.GetDoubles(DicomTags.PixelSpacing);
        double? between = Find(ds, DicomTags.SpacingBetweenSlices, f)?.Holder.GetDoubleOrNull(DicomTags.SpacingBetweenSlices);
        double? thickness = Find(ds, DicomTags.SliceThickness, f)?.Holder.GetDoubleOrNull(DicomTags.SliceThickness);
        if (ipp is null && slices is { } s && DerivedSlice(ds, f, s.Uids) is int k)
        {
            var g = s.Grid;
            ipp = g.IndexToPhysical(0, 0, k).ToArray();
            iop ??= [.. g.Direction.Column(0).ToArray(), .. g.Direction.Column(1).ToArray()];
            ps ??= [g.SpacingMm.Y, g.SpacingMm.X];
        }
        if (ipp is not { Length: 3 } || iop is not { Length: 6 } || ps is not { Length: 2 } || !(ps[0] > 0) || !(ps[1] > 0))
            throw new InputFormatException($"frame {f + 1} lacks Plane Position, Plane Orientation or Pixel Measures", where,
                "PS3.3 C.7.6.16.2: a SEG frame needs its position, orientation and pixel spacing to be placed");
        var row = new Vec3(iop[0], iop[1], iop[2]);
        var col = new Vec3(iop[3], iop[4], iop[5]);
        if (Math.Abs(row.Norm - 1) > 1e-3 || Math.Abs(col.Norm - 1) > 1e-3 || Math.Abs(row.Dot(col)) > 1e-3)
            throw new InputFormatException($"frame {f + 1} Image Orientation (Patient) is not two orthogonal unit vectors", where);
        return new SegFrame(segment, new Vec3(ipp[0], ipp[1], ipp[2]), row.Normalized(), col.Normalized(), ps[0], ps[1],
            between is > 0 ? between : null, thickness is > 0 ? thickness : null);
    }

    private static DicomFunctionalGroups.Found? Find(DicomDataset ds, DicomTag tag, int f) => DicomFunctionalGroups.Find(ds, tag, f);

    private static int? DerivedSlice(DicomDataset ds, int f, IReadOnlyList<string> uids)
    {
        var perFrame = ds.GetSequence(DicomTags.PerFrameFunctionalGroupsSequence)[f];
        foreach (var derivation in perFrame.GetSequence(DicomTags.DerivationImageSequence))
            foreach (var source in derivation.GetSequence(DicomTags.SourceImageSequence))
                if (source.GetStringOrNull(DicomTags.ReferencedSOPInstanceUID)?.Trim() is { } uid)
                    for (int k = 0; k < uids.Count; k++)
                        if (uids[k] == uid) return k;
        return null;
    }
}
