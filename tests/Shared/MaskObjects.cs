using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Tests.Shared;

/// <summary>DICOM mask objects the engine does not write itself, built for tests: FRACTIONAL SEGs and hand-made RTSTRUCTs.</summary>
public static class MaskObjects
{
    /// <summary>
    /// A one-segment FRACTIONAL SEG (PS3.3 C.8.20.2.3: stored value / Maximum Fractional Value = fraction), built on the
    /// binary writer's header and frame layout with 8-bit pixels.
    /// </summary>
    public static void WriteFractionalSeg(string path, Volume<float> fractions, int maxValue, SegSourceReference? source = null)
    {
        var grid = fractions.Geometry;
        var any = fractions.Like<byte>();
        for (int i = 0; i < any.Voxels.Length; i++) any.Voxels[i] = fractions.Voxels[i] > 0 ? (byte)1 : (byte)0;
        SegmentDefinition[] segments = [new("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "test", any)];
        var ds = SegmentationWriter.Build(grid, segments, new DicomStudyInfo("T", null, null, new DateOnly(2024, 1, 2)), source);
        var frames = SegmentationWriter.Frames(segments);
        int plane = grid.Size.X * grid.Size.Y;
        var pixels = new byte[plane * frames.Count];
        for (int f = 0; f < frames.Count; f++)
        {
            var slice = fractions.Slice(frames[f].Slice);
            for (int i = 0; i < plane; i++) pixels[f * plane + i] = (byte)Math.Round(Math.Clamp(slice[i], 0, 1) * maxValue);
        }
        ds.Add(DicomTags.SegmentationType, DicomVR.CS, "FRACTIONAL")
          .Add(DicomTags.SegmentationFractionalType, DicomVR.CS, "PROBABILITY")
          .Add(DicomTags.MaximumFractionalValue, DicomVR.US, maxValue)
          .AddMonochromePixelModule(grid.Size.Y, grid.Size.X, bitsAllocated: 8, bitsStored: 8)
          .AddBytes(DicomTags.PixelData, DicomVR.OB, pixels);
        DicomPart10Writer.Write(path, ds);
    }

    /// <summary>A minimal RT Structure Set: the given ROIs, each a list of contours (x, y, z LPS mm per point).</summary>
    public static void WriteRtStruct(string path, string frameOfReference, params (string Name, IReadOnlyList<double[]> Contours, string Type)[] rois)
    {
        var ds = new DicomWriteDataset()
            .Add(DicomTags.SOPClassUID, DicomVR.UI, MaskSopClasses.RtStructureSet)
            .Add(DicomTags.SOPInstanceUID, DicomVR.UI, DicomUids.New())
            .Add(DicomTags.Modality, DicomVR.CS, "RTSTRUCT")
            .AddSequence(DicomTags.ReferencedFrameOfReferenceSequence, new DicomWriteDataset().Add(DicomTags.FrameOfReferenceUID, DicomVR.UI, frameOfReference))
            .AddSequence(DicomTags.StructureSetROISequence, [.. rois.Select((r, n) => new DicomWriteDataset()
                .Add(DicomTags.ROINumber, DicomVR.IS, n + 1)
                .Add(DicomTags.ReferencedFrameOfReferenceUID, DicomVR.UI, frameOfReference)
                .Add(DicomTags.ROIName, DicomVR.LO, r.Name))])
            .AddSequence(DicomTags.ROIContourSequence, [.. rois.Select((r, n) => new DicomWriteDataset()
                .Add(DicomTags.ReferencedROINumber, DicomVR.IS, n + 1)
                .AddSequence(DicomTags.ContourSequence, [.. r.Contours.Select(c => new DicomWriteDataset()
                    .Add(DicomTags.ContourGeometricType, DicomVR.CS, r.Type)
                    .Add(DicomTags.NumberOfContourPoints, DicomVR.IS, c.Length / 3)
                    .Add(DicomTags.ContourData, DicomVR.DS, c))]))]);
        DicomPart10Writer.Write(path, ds);
    }

    /// <summary>A polygon given in continuous voxel indices (x, y pairs) on slice <paramref name="k"/>, as LPS points.</summary>
    public static double[] OnSlice(Geometry g, double k, params double[] xy)
    {
        var p = new double[xy.Length / 2 * 3];
        for (int n = 0; n < xy.Length / 2; n++)
        {
            var w = g.IndexToPhysical(new Vec3(xy[2 * n], xy[2 * n + 1], k));
            (p[3 * n], p[3 * n + 1], p[3 * n + 2]) = (w.X, w.Y, w.Z);
        }
        return p;
    }
}
