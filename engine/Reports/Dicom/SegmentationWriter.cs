using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Builds a binary DICOM Segmentation (SOP Class 1.2.840.10008.5.1.4.1.1.66.4; PS3.3 A.51 and C.8.20):
/// 1 bit per pixel packed across frames (PS3.5 8.1.1 — first pixel in the least significant bit), one frame
/// per segment and source slice that holds any voxel, Shared Functional Groups (Pixel Measures, Plane
/// Orientation) and Per-frame Functional Groups (Frame Content with dimension index values, Plane Position,
/// Derivation Image when the source is DICOM, Segment Identification). Frames lie on the source grid.
/// </summary>
public static class SegmentationWriter
{
    /// <summary>Segmentation Storage SOP Class UID (PS3.4 B.5).</summary>
    public const string SegmentationStorage = Io.Masks.MaskSopClasses.Segmentation;

    /// <summary>Writes the SEG file and returns its identifiers (for references from an SR).</summary>
    public static DicomObjectIds Write(string path, Geometry grid, IReadOnlyList<SegmentDefinition> segments, DicomStudyInfo study,
        SegSourceReference? source, string uidRoot = DicomUids.UuidRoot, int seriesNumber = 900, string? uidSeed = null)
    {
        var ds = Build(grid, segments, study, source, uidRoot, seriesNumber, uidSeed);
        DicomPart10Writer.Write(path, ds);
        return DicomObjectIds.Of(ds);
    }

    /// <summary>
    /// The SEG data set. With <paramref name="uidSeed"/> the new UIDs are derived from it and the content date is
    /// the study date (repeatable files, e.g. phantoms); otherwise UIDs are random and dates are now.
    /// </summary>
    public static DicomWriteDataset Build(Geometry grid, IReadOnlyList<SegmentDefinition> segments, DicomStudyInfo study,
        SegSourceReference? source, string uidRoot = DicomUids.UuidRoot, int seriesNumber = 900, string? uidSeed = null)
    {
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(segments);
        ArgumentNullException.ThrowIfNull(study);
        if (segments.Count == 0) throw new ArgumentException("a SEG needs at least one segment", nameof(segments));
        foreach (var s in segments) grid.RequireCongruent(s.Mask.Geometry, $"mask of segment '{s.Label}'");
        if (source is not null && source.SopInstanceUids.Count != grid.Size.Z)
            throw new ArgumentException($"{source.SopInstanceUids.Count} source instances for {grid.Size.Z} slices", nameof(source));
        var frames = Frames(segments);
        var uids = new SegmentationHeader.UidSource(uidRoot, uidSeed);
        var now = uidSeed is not null && study.StudyDate is { } d ? d.ToDateTime(new TimeOnly(12, 0)) : DateTime.UtcNow;
        string dimOrg = uids.Next("dimension-organization");
        var ds = new DicomWriteDataset();
        SegmentationHeader.AddPatientStudySeries(ds, study, source, uids, seriesNumber, now);
        ds.Add(DicomTags.SOPClassUID, DicomVR.UI, SegmentationStorage)
          .Add(DicomTags.SOPInstanceUID, DicomVR.UI, uids.Next("sop-instance"))
          .Add(DicomTags.ImageType, DicomVR.CS, "DERIVED", "PRIMARY")
          .Add(DicomTags.InstanceNumber, DicomVR.IS, 1)
          .Add(DicomTags.ContentLabel, DicomVR.CS, "SERIMETRY_SEG")
          .Add(DicomTags.ContentDescription, DicomVR.LO, "Gland and lesion outlines")
          .Add(DicomTags.ContentCreatorName, DicomVR.PN, "")
          .AddMonochromePixelModule(grid.Size.Y, grid.Size.X, bitsAllocated: 1, bitsStored: 1)
          .Add(DicomTags.LossyImageCompression, DicomVR.CS, "00")
          .Add(DicomTags.SegmentationType, DicomVR.CS, "BINARY")
          .Add(DicomTags.NumberOfFrames, DicomVR.IS, frames.Count)
          .AddSequence(DicomTags.SegmentSequence, [.. segments.Select((s, i) => SegmentItem(s, i + 1, uidRoot))])
          .AddSequence(DicomTags.DimensionOrganizationSequence, new DicomWriteDataset().Add(DicomTags.DimensionOrganizationUID, DicomVR.UI, dimOrg))
          .AddSequence(DicomTags.DimensionIndexSequence,
              DimensionIndex(dimOrg, DicomTags.ReferencedSegmentNumber, DicomTags.SegmentIdentificationSequence, "ReferencedSegmentNumber"),
              DimensionIndex(dimOrg, DicomTags.ImagePositionPatient, DicomTags.PlanePositionSequence, "ImagePositionPatient"))
          .AddSequence(DicomTags.SharedFunctionalGroupsSequence, Shared(grid))
          .AddSequence(DicomTags.PerFrameFunctionalGroupsSequence, [.. frames.Select(f => PerFrame(grid, f, source))])
          .AddBytes(DicomTags.PixelData, DicomVR.OB, Pack(segments, frames, grid));
        if (source is not null)
            ds.AddSequence(DicomTags.ReferencedSeriesSequence, new DicomWriteDataset()
                .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, source.SeriesInstanceUid)
                .AddSequence(DicomTags.ReferencedInstanceSequence, [.. source.SopInstanceUids.Select(u => Reference(source.SopClassUid, u))]));
        return ds;
    }

    /// <summary>(segment index, slice) of every frame: segments in order, slices ascending, empty slices left out.</summary>
    internal static List<(int Segment, int Slice)> Frames(IReadOnlyList<SegmentDefinition> segments)
    {
        var frames = new List<(int, int)>();
        for (int s = 0; s < segments.Count; s++)
        {
            var m = segments[s].Mask;
            int before = frames.Count;
            for (int k = 0; k < m.Size.Z; k++)
                if (m.Slice(k).ContainsAnyExcept((byte)0)) frames.Add((s, k));
            // A segment needs at least one frame to be referenced (PS3.3 C.8.20.2.2): an empty slice 0 then.
            if (frames.Count == before) frames.Add((s, 0));
        }
        return frames;
    }

    private static byte[] Pack(IReadOnlyList<SegmentDefinition> segments, List<(int Segment, int Slice)> frames, Geometry grid)
    {
        int plane = grid.Size.X * grid.Size.Y;
        long bits = (long)plane * frames.Count;
        var bytes = new byte[(bits + 7) / 8];
        long bit = 0;
        foreach (var (s, k) in frames)
        {
            var slice = segments[s].Mask.Slice(k);
            for (int i = 0; i < plane; i++, bit++)
                if (slice[i] != 0) bytes[bit >> 3] |= (byte)(1 << (int)(bit & 7));
        }
        return bytes;
    }

    private static DicomWriteDataset SegmentItem(SegmentDefinition s, int number, string uidRoot)
    {
        var item = new DicomWriteDataset()
            .Add(DicomTags.SegmentNumber, DicomVR.US, number)
            .Add(DicomTags.SegmentLabel, DicomVR.LO, s.Label)
            .Add(DicomTags.SegmentAlgorithmType, DicomVR.CS, s.AlgorithmType)
            .AddSequence(DicomTags.SegmentedPropertyCategoryCodeSequence, Code(s.Category))
            .AddSequence(DicomTags.SegmentedPropertyTypeCodeSequence, Code(s.Type));
        if (s.AlgorithmName is { } name) item.Add(DicomTags.SegmentAlgorithmName, DicomVR.LO, name);
        if (s.TrackingId is { } id)
            item.Add(DicomTags.TrackingID, DicomVR.UT, id).Add(DicomTags.TrackingUID, DicomVR.UI, DicomUids.FromName("tracking/" + id, uidRoot));
        return item;
    }

    /// <summary>A Code Sequence Macro item (PS3.3 table 8.8-1).</summary>
    public static DicomWriteDataset Code(DicomCode c) => new DicomWriteDataset()
        .Add(DicomTags.CodeValue, DicomVR.SH, c.Value)
        .Add(DicomTags.CodingSchemeDesignator, DicomVR.SH, c.Scheme)
        .Add(DicomTags.CodeMeaning, DicomVR.LO, c.Meaning);

    private static DicomWriteDataset DimensionIndex(string org, DicomTag pointer, DicomTag group, string label) => new DicomWriteDataset()
        .AddTag(DicomTags.DimensionIndexPointer, pointer)
        .AddTag(DicomTags.FunctionalGroupPointer, group)
        .Add(DicomTags.DimensionOrganizationUID, DicomVR.UI, org)
        .Add(DicomTags.DimensionDescriptionLabel, DicomVR.LO, label);

    private static DicomWriteDataset Shared(Geometry g)
    {
        var r = g.Direction.Column(0);
        var c = g.Direction.Column(1);
        return new DicomWriteDataset()
            .AddSequence(DicomTags.PixelMeasuresSequence, new DicomWriteDataset()
                .Add(DicomTags.PixelSpacing, DicomVR.DS, g.SpacingMm.Y, g.SpacingMm.X)
                .Add(DicomTags.SliceThickness, DicomVR.DS, g.SpacingMm.Z)
                .Add(DicomTags.SpacingBetweenSlices, DicomVR.DS, g.SpacingMm.Z))
            .AddSequence(DicomTags.PlaneOrientationSequence, new DicomWriteDataset()
                .Add(DicomTags.ImageOrientationPatient, DicomVR.DS, R(r.X), R(r.Y), R(r.Z), R(c.X), R(c.Y), R(c.Z)));
    }

    private static DicomWriteDataset PerFrame(Geometry g, (int Segment, int Slice) f, SegSourceReference? source)
    {
        var p = g.IndexToPhysical(0, 0, f.Slice);
        var item = new DicomWriteDataset()
            .AddSequence(DicomTags.FrameContentSequence, new DicomWriteDataset()
                .Add(DicomTags.DimensionIndexValues, DicomVR.UL, f.Segment + 1, f.Slice + 1))
            .AddSequence(DicomTags.PlanePositionSequence, new DicomWriteDataset()
                .Add(DicomTags.ImagePositionPatient, DicomVR.DS, R(p.X), R(p.Y), R(p.Z)))
            .AddSequence(DicomTags.SegmentIdentificationSequence, new DicomWriteDataset()
                .Add(DicomTags.ReferencedSegmentNumber, DicomVR.US, f.Segment + 1));
        if (source is not null)
            item.AddSequence(DicomTags.DerivationImageSequence, new DicomWriteDataset()
                .AddSequence(DicomTags.SourceImageSequence, Reference(source.SopClassUid, source.SopInstanceUids[f.Slice])
                    .AddSequence(DicomTags.PurposeOfReferenceCodeSequence,
                        Code(new DicomCode("121322", "DCM", "Source image for image processing operation"))))
                .AddSequence(DicomTags.DerivationCodeSequence, Code(new DicomCode("113076", "DCM", "Segmentation"))));
        return item;
    }

    private static DicomWriteDataset Reference(string sopClass, string sopInstance) => new DicomWriteDataset()
        .Add(DicomTags.ReferencedSOPClassUID, DicomVR.UI, sopClass)
        .Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, sopInstance);

    private static double R(double v) => Math.Round(v, 6);
}
