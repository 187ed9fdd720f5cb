using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Finds the T2w series of a DICOM exam folder the way the exam loader picks it (<see cref="SeriesSelector"/>)
/// and lists its SOP Instance UIDs in grid slice order, for the SEG's Referenced Series and Derivation Image
/// references (PS3.3 C.12.2, C.7.6.16.2.6).
/// </summary>
public static class SegSourceResolver
{
    /// <summary>
    /// The reference, or null when the exam is not DICOM, has no usable T2w series, or its slices sit inside
    /// a .zip (no per-file header to read).
    /// Returns the study's Study Instance UID too, to match it to a visit.
    /// </summary>
    public static (string? StudyInstanceUid, SegSourceReference Reference)? FromExam(string examPath)
    {
        if (!Directory.Exists(examPath) || File.Exists(Path.Combine(examPath, Exams.ExamManifest.FileName))) return null;
        var studies = StudyIndex.Build(examPath, DicomSliceHeaderReader.Default).Assemble(null);
        if (studies.Count != 1) return null;
        var series = SeriesSelector.Select(studies[0], SeriesRole.T2w).Series;
        var stack = series?.StackFor();
        if (series is null || stack is null || stack.Slices.Any(s => s.SopInstanceUid is null || s.Source.Entry is not null))
            return null;
        var first = DicomFile.ReadHeader(stack.Slices[0].Source.Container).Dataset;
        var sopClass = first.GetStringOrNull(DicomTags.SOPClassUID)?.Trim();
        if (sopClass is null) return null;
        var reference = new SegSourceReference(series.SeriesInstanceUid, sopClass, [.. stack.Slices.Select(s => s.SopInstanceUid!)],
            first.GetStringOrNull(DicomTags.FrameOfReferenceUID)?.Trim(), first.GetStringOrNull(DicomTags.PatientName),
            NonEmpty(first.GetStringOrNull(DicomTags.StudyTime)), NonEmpty(first.GetStringOrNull(DicomTags.StudyID)));
        return (studies[0].StudyInstanceUid, reference);
    }

    private static string? NonEmpty(string? s) => string.IsNullOrWhiteSpace(s) ? null : s.Trim();
}
