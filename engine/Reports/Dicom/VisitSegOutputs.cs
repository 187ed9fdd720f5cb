using Serimetry.Engine.Compare;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Writes <c>seg-&lt;visit&gt;.dcm</c> for every visit of a comparison (visit 0 = baseline): segment 1
/// 'Prostate' (the gland outline on that visit), segment 2 'Lesion' (re-fitted, else propagated), on the
/// visit's T2w grid. For DICOM exams the SEG joins the visit's study and references its T2w series; for
/// NIfTI exams it carries its own study and frame of reference and no image references (docs/dicom-out.md).
/// </summary>
internal static class VisitSegOutputs
{
    public static IReadOnlyList<string> Write(IReadOnlyList<VisitImages> visits, IReadOnlyList<string> examPaths, string outDir,
        string uidRoot = DicomUids.UuidRoot) => WriteWithIds(visits, examPaths, outDir, uidRoot).Select(s => $"seg-{s.VisitIndex}.dcm").ToList();

    /// <summary>Writes the SEGs and returns what an SR needs to reference them.</summary>
    public static IReadOnlyList<VisitSegReference> WriteWithIds(IReadOnlyList<VisitImages> visits, IReadOnlyList<string> examPaths,
        string outDir, string uidRoot = DicomUids.UuidRoot)
    {
        var written = new List<VisitSegReference>();
        var references = Resolve(visits, examPaths);
        foreach (var v in visits)
        {
            var segments = Segments(v);
            if (segments.Count == 0) continue;
            var grid = v.Exam.T2w.Geometry;
            references.TryGetValue(v.Index, out var reference);
            var study = new DicomStudyInfo(v.Exam.PatientId, null, v.Exam.StudyInstanceUid, v.Exam.Date);
            var file = $"seg-{v.Index}.dcm";
            var ids = SegmentationWriter.Write(Path.Combine(outDir, file), grid, segments, study, reference, uidRoot);
            written.Add(new VisitSegReference(v.Index, ids, segments.Select((s, i) => (s.Label, Number: i + 1)).ToDictionary(x => x.Label, x => x.Number),
                reference?.PatientName, reference?.StudyTime, reference?.StudyId));
        }
        return written;
    }

    /// <summary>
    /// Writes <c>sr.dcm</c> (TID 1500) referencing the SEGs; it joins the latest visit's study when that
    /// exam is DICOM. Returns the file name.
    /// </summary>
    public static string WriteSr(Reports.ChangeReport report, IReadOnlyList<VisitImages> visits, IReadOnlyList<VisitSegReference> segs,
        string outDir, string uidRoot = DicomUids.UuidRoot)
    {
        var last = visits[^1].Exam;
        var lastSeg = segs.LastOrDefault(s => s.VisitIndex == visits[^1].Index);
        MeasurementReportWriter.Write(Path.Combine(outDir, "sr.dcm"), report,
            new DicomStudyInfo(last.PatientId, segs.LastOrDefault(s => s.PatientName is not null)?.PatientName, last.StudyInstanceUid, last.Date,
                lastSeg?.StudyTime, lastSeg?.StudyId),
            segs, uidRoot);
        return "sr.dcm";
    }

    internal static List<SegmentDefinition> Segments(VisitImages v)
    {
        bool baseline = v.Index == 0;
        string type = baseline ? "SEMIAUTOMATIC" : "AUTOMATIC";
        var list = new List<SegmentDefinition>();
        if (v.Gland is { } gland)
            list.Add(new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, type,
                baseline ? "Serimetry: supplied baseline outline" : "Serimetry: baseline outline propagated by registration", gland, "prostate"));
        var lesion = v.Lesion?.Mask ?? v.PropagatedLesion;
        if (lesion is not null)
            list.Add(new SegmentDefinition("Lesion", DicomCode.MorphologicallyAlteredStructure, DicomCode.Neoplasm, type,
                baseline ? "Serimetry: supplied baseline outline"
                    : v.Lesion is { Refitted: true } ? "Serimetry: lesion re-fit" : "Serimetry: baseline outline propagated by registration",
                lesion, "lesion-1"));
        return list;
    }

    /// <summary>Visit index → T2w reference, matched by Study Instance UID; empty for NIfTI exams.</summary>
    private static Dictionary<int, SegSourceReference> Resolve(IReadOnlyList<VisitImages> visits, IReadOnlyList<string> examPaths)
    {
        var map = new Dictionary<int, SegSourceReference>();
        foreach (var path in examPaths)
        {
            if (SegSourceResolver.FromExam(path) is not { } found) continue;
            var v = visits.FirstOrDefault(x => x.Exam.StudyInstanceUid is { } uid && uid == found.StudyInstanceUid);
            if (v is not null && found.Reference.SopInstanceUids.Count == v.Exam.T2w.Size.Z) map[v.Index] = found.Reference;
        }
        return map;
    }
}
