using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Masks;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>One ROI of an RT Structure Set: its name, mask and RT ROI Interpreted Type (PS3.3 C.8.8.8, e.g. ORGAN, GTV).</summary>
public sealed record RoiDefinition(string Name, Volume<byte> Mask, string InterpretedType = "ORGAN");

/// <summary>
/// Builds a DICOM RT Structure Set (SOP Class 1.2.840.10008.5.1.4.1.1.481.3; PS3.3 A.19: Patient, General Study,
/// RT Series, Frame of Reference, General Equipment, Structure Set, ROI Contour, RT ROI Observations, SOP Common). Each ROI's mask
/// becomes CLOSED_PLANAR contours on every slice that holds it, traced by marching squares
/// (<see cref="SliceContours"/>) and written in patient coordinates (LPS mm, 0.1 µm steps); filled by the
/// even-odd rule at voxel centres they give the mask back exactly (docs/masks.md). With a source series each
/// contour references its slice's image (Contour Image Sequence) and the structure set lists the series.
/// </summary>
public static class RtStructWriter
{
    /// <summary>RT Structure Set Storage SOP Class UID (PS3.4 B.5).</summary>
    public const string RtStructureSetStorage = MaskSopClasses.RtStructureSet;

    /// <summary>Study Component Management SOP Class, the Referenced SOP Class of RT Referenced Study items (PS3.3 C.8.8.5, from memory).</summary>
    private const string StudyReferenceClass = "1.2.840.10008.3.1.2.3.1";

    /// <summary>Writes the file and returns its identifiers.</summary>
    public static DicomObjectIds Write(string path, Geometry grid, IReadOnlyList<RoiDefinition> rois, DicomStudyInfo study,
        SegSourceReference? source, string uidRoot = DicomUids.UuidRoot, int seriesNumber = 901, string? uidSeed = null)
    {
        var ds = Build(grid, rois, study, source, uidRoot, seriesNumber, uidSeed);
        DicomPart10Writer.Write(path, ds);
        return DicomObjectIds.Of(ds);
    }

    /// <summary>The RTSTRUCT data set; UIDs derived from <paramref name="uidSeed"/> when given (repeatable files).</summary>
    public static DicomWriteDataset Build(Geometry grid, IReadOnlyList<RoiDefinition> rois, DicomStudyInfo study, SegSourceReference? source,
        string uidRoot = DicomUids.UuidRoot, int seriesNumber = 901, string? uidSeed = null)
    {
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(rois);
        ArgumentNullException.ThrowIfNull(study);
        if (rois.Count == 0) throw new ArgumentException("a structure set needs at least one ROI", nameof(rois));
        foreach (var r in rois) grid.RequireCongruent(r.Mask.Geometry, $"mask of ROI '{r.Name}'");
        if (source is not null && source.SopInstanceUids.Count != grid.Size.Z)
            throw new ArgumentException($"{source.SopInstanceUids.Count} source instances for {grid.Size.Z} slices", nameof(source));
        var uids = new SegmentationHeader.UidSource(uidRoot, uidSeed);
        var now = uidSeed is not null && study.StudyDate is { } d ? d.ToDateTime(new TimeOnly(12, 0)) : DateTime.UtcNow;
        string frame = source?.FrameOfReferenceUid ?? uids.Next("frame-of-reference");
        var ds = new DicomWriteDataset();
        SegmentationHeader.AddPatientStudySeries(ds, study, source, uids, seriesNumber, now, "RTSTRUCT");
        string studyUid = System.Text.Encoding.ASCII.GetString(ds.Elements.First(e => e.Tag == DicomTags.StudyInstanceUID).Value).TrimEnd('\0');
        ds.Remove(DicomTags.ContentDate).Remove(DicomTags.ContentTime)
          .Add(DicomTags.SOPClassUID, DicomVR.UI, RtStructureSetStorage)
          .Add(DicomTags.SOPInstanceUID, DicomVR.UI, uids.Next("sop-instance"))
          .Add(DicomTags.InstanceNumber, DicomVR.IS, 1)
          .Add(DicomTags.FrameOfReferenceUID, DicomVR.UI, frame)
          .Add(DicomTags.PositionReferenceIndicator, DicomVR.LO, "")
          .Add(DicomTags.OperatorsName, DicomVR.PN, "")
          .Add(DicomTags.StructureSetLabel, DicomVR.SH, "SERIMETRY")
          .Add(DicomTags.StructureSetName, DicomVR.LO, "Serimetry outlines")
          .Add(DicomTags.StructureSetDate, DicomVR.DA, now.ToString("yyyyMMdd", CultureInfo.InvariantCulture))
          .Add(DicomTags.StructureSetTime, DicomVR.TM, now.ToString("HHmmss", CultureInfo.InvariantCulture))
          .AddSequence(DicomTags.ReferencedFrameOfReferenceSequence, FrameItem(frame, studyUid, source))
          .AddSequence(DicomTags.StructureSetROISequence, [.. rois.Select((r, n) => new DicomWriteDataset()
              .Add(DicomTags.ROINumber, DicomVR.IS, n + 1)
              .Add(DicomTags.ReferencedFrameOfReferenceUID, DicomVR.UI, frame)
              .Add(DicomTags.ROIName, DicomVR.LO, r.Name)
              .Add(DicomTags.ROIGenerationAlgorithm, DicomVR.CS, "AUTOMATIC"))])
          .AddSequence(DicomTags.ROIContourSequence, [.. rois.Select((r, n) => ContourItem(grid, r, n + 1, source))])
          .AddSequence(DicomTags.RTROIObservationsSequence, [.. rois.Select((r, n) => new DicomWriteDataset()
              .Add(DicomTags.ObservationNumber, DicomVR.IS, n + 1)
              .Add(DicomTags.ReferencedROINumber, DicomVR.IS, n + 1)
              .Add(DicomTags.RTROIInterpretedType, DicomVR.CS, r.InterpretedType)
              .Add(DicomTags.ROIInterpreter, DicomVR.PN, ""))]);
        return ds;
    }

    private static DicomWriteDataset FrameItem(string frame, string studyUid, SegSourceReference? source)
    {
        var item = new DicomWriteDataset().Add(DicomTags.FrameOfReferenceUID, DicomVR.UI, frame);
        if (source is null) return item;
        var series = new DicomWriteDataset()
            .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, source.SeriesInstanceUid)
            .AddSequence(DicomTags.ContourImageSequence, [.. source.SopInstanceUids.Select(u => ImageReference(source.SopClassUid, u))]);
        return item.AddSequence(DicomTags.RTReferencedStudySequence, new DicomWriteDataset()
            .Add(DicomTags.ReferencedSOPClassUID, DicomVR.UI, StudyReferenceClass)
            .Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, studyUid)
            .AddSequence(DicomTags.RTReferencedSeriesSequence, series));
    }

    private static DicomWriteDataset ContourItem(Geometry grid, RoiDefinition roi, int number, SegSourceReference? source)
    {
        var contours = new List<DicomWriteDataset>();
        for (int k = 0; k < grid.Size.Z; k++)
        {
            var slice = roi.Mask.Slice(k);
            if (!slice.ContainsAnyExcept((byte)0)) continue;
            foreach (var loop in SliceContours.Trace(slice, grid.Size.X, grid.Size.Y))
            {
                int n = loop.Length / 2;
                var xyz = new double[3 * n];
                for (int p = 0; p < n; p++)
                {
                    var w = grid.IndexToPhysical(new Vec3(loop[2 * p], loop[2 * p + 1], k));
                    xyz[3 * p] = Math.Round(w.X, 4);
                    xyz[3 * p + 1] = Math.Round(w.Y, 4);
                    xyz[3 * p + 2] = Math.Round(w.Z, 4);
                }
                var item = new DicomWriteDataset()
                    .Add(DicomTags.ContourNumber, DicomVR.IS, contours.Count + 1)
                    .Add(DicomTags.ContourGeometricType, DicomVR.CS, "CLOSED_PLANAR")
                    .Add(DicomTags.NumberOfContourPoints, DicomVR.IS, n)
                    .Add(DicomTags.ContourData, DicomVR.DS, xyz);
                if (source is not null)
                    item.AddSequence(DicomTags.ContourImageSequence, ImageReference(source.SopClassUid, source.SopInstanceUids[k]));
                contours.Add(item);
            }
        }
        var roiItem = new DicomWriteDataset()
            .Add(DicomTags.ReferencedROINumber, DicomVR.IS, number)
            .Add(DicomTags.ROIDisplayColor, DicomVR.IS, Colour(number));
        if (contours.Count > 0) roiItem.AddSequence(DicomTags.ContourSequence, [.. contours]);
        return roiItem;
    }

    private static double[] Colour(int number) => (number % 3) switch
    {
        1 => [255, 200, 0],
        2 => [0, 200, 255],
        _ => [255, 0, 160],
    };

    private static DicomWriteDataset ImageReference(string sopClass, string sopInstance) => new DicomWriteDataset()
        .Add(DicomTags.ReferencedSOPClassUID, DicomVR.UI, sopClass)
        .Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, sopInstance);
}
