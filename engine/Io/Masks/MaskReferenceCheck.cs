using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// Checks that a SEG or RTSTRUCT refers to the images it is applied to (docs/masks.md): the Frame of Reference
/// must match when both sides name one (PS3.3 C.7.4.1: patient coordinates are only comparable inside one
/// frame of reference); otherwise at least one referenced series must belong to the exam.
/// </summary>
internal static class MaskReferenceCheck
{
    public static void Check(DicomDataset ds, MaskReference? expected, string where)
    {
        if (expected is null) return;
        var frames = FramesOfReference(ds);
        if (expected.FrameOfReferenceUid is { Length: > 0 } own && frames.Count > 0)
        {
            if (!frames.Contains(own))
                throw new GeometryMismatchException(
                    $"the mask is in Frame of Reference {string.Join(", ", frames)}, the images in {own}", where,
                    "give the outline drawn on this exam's images (or register and resample it first)");
            return;
        }
        var series = ReferencedSeries(ds);
        if (expected.SeriesInstanceUids is { Count: > 0 } known && series.Count > 0 && !series.Overlaps(known))
            throw new InputFormatException($"the mask references series {string.Join(", ", series)}, which this exam does not hold", where,
                "give the outline drawn on this exam's images, or the exam the outline was drawn on");
    }

    private static HashSet<string> FramesOfReference(DicomDataset ds)
    {
        var set = new HashSet<string>(StringComparer.Ordinal);
        Add(set, ds.GetStringOrNull(DicomTags.FrameOfReferenceUID));
        foreach (var item in ds.GetSequence(DicomTags.ReferencedFrameOfReferenceSequence))
            Add(set, item.GetStringOrNull(DicomTags.FrameOfReferenceUID));
        return set;
    }

    private static HashSet<string> ReferencedSeries(DicomDataset ds)
    {
        var set = new HashSet<string>(StringComparer.Ordinal);
        foreach (var item in ds.GetSequence(DicomTags.ReferencedSeriesSequence))
            Add(set, item.GetStringOrNull(DicomTags.SeriesInstanceUID));
        foreach (var frame in ds.GetSequence(DicomTags.ReferencedFrameOfReferenceSequence))
            foreach (var study in frame.GetSequence(DicomTags.RTReferencedStudySequence))
                foreach (var series in study.GetSequence(DicomTags.RTReferencedSeriesSequence))
                    Add(set, series.GetStringOrNull(DicomTags.SeriesInstanceUID));
        return set;
    }

    private static void Add(HashSet<string> set, string? uid)
    {
        if (uid?.Trim('\0', ' ') is { Length: > 0 } u) set.Add(u);
    }
}
