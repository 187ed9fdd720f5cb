using System.Globalization;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>The SEG written for one visit, for the SR's references (segment numbers by label).</summary>
/// <param name="VisitIndex">0 = baseline.</param>
/// <param name="Seg">Identifiers of the SEG.</param>
/// <param name="SegmentNumbers">Segment number by label.</param>
/// <param name="PatientName">Patient's Name of the source images when the exam is DICOM, else null.</param>
/// <param name="StudyTime">Study Time of the source images when the exam is DICOM and has one, else null.</param>
/// <param name="StudyId">Study ID of the source images when the exam is DICOM and has one, else null.</param>
public sealed record VisitSegReference(int VisitIndex, DicomObjectIds Seg, IReadOnlyDictionary<string, int> SegmentNumbers,
    string? PatientName = null, string? StudyTime = null, string? StudyId = null);

/// <summary>
/// Writes a change report as a Comprehensive SR (SOP Class 1.2.840.10008.5.1.4.1.1.88.33, PS3.3 A.35.3)
/// following TID 1500 "Measurement Report" (PS3.16): language, device observer context, procedure reported,
/// and under Imaging Measurements one Measurement Group (TID 1411) per visit and region (gland, lesion) with a
/// tracking identifier and UID, the finding and finding site, the visit's time point, a reference to the
/// segment in that visit's SEG, and NUM items (UCUM units) for every measured value; follow-ups add the
/// change from baseline with its 95 % band. Codes: <see cref="SrCodes"/>.
/// </summary>
public static class MeasurementReportWriter
{
    /// <summary>Comprehensive SR Storage (PS3.4 B.5).</summary>
    public const string ComprehensiveSr = "1.2.840.10008.5.1.4.1.1.88.33";

    /// <summary>Writes the SR and returns its identifiers.</summary>
    public static DicomObjectIds Write(string path, ChangeReport report, DicomStudyInfo study, IReadOnlyList<VisitSegReference> segs,
        string uidRoot = DicomUids.UuidRoot)
    {
        var ds = Build(report, study, segs, uidRoot);
        DicomPart10Writer.Write(path, ds);
        return DicomObjectIds.Of(ds);
    }

    /// <summary>The SR data set.</summary>
    public static DicomWriteDataset Build(ChangeReport report, DicomStudyInfo study, IReadOnlyList<VisitSegReference> segs,
        string uidRoot = DicomUids.UuidRoot)
    {
        ArgumentNullException.ThrowIfNull(report);
        ArgumentNullException.ThrowIfNull(segs);
        var now = DateTime.UtcNow;
        var ds = new DicomWriteDataset();
        SegmentationHeader.AddPatientStudySeries(ds, study, null, new SegmentationHeader.UidSource(uidRoot, null), 901, now, "SR");
        var groups = new List<DicomWriteDataset>();
        foreach (var v in report.Visits)
        {
            var seg = segs.FirstOrDefault(s => s.VisitIndex == v.Index);
            foreach (var (region, label, prefix) in new[] { ("prostate", "Prostate", "gland."), ("lesion-1", "Lesion", "lesion.") })
                if (Group(report, v, region, label, prefix, seg, uidRoot) is { } g) groups.Add(g);
        }
        ds.Add(DicomTags.SOPClassUID, DicomVR.UI, ComprehensiveSr)
          .Add(DicomTags.SOPInstanceUID, DicomVR.UI, DicomUids.New(uidRoot))
          .Add(DicomTags.InstanceNumber, DicomVR.IS, 1)
          .AddSequence(DicomTags.CodingSchemeIdentificationSequence, SrCodes.SchemeIdentification())
          .Add(DicomTags.CompletionFlag, DicomVR.CS, "COMPLETE")
          .Add(DicomTags.VerificationFlag, DicomVR.CS, "UNVERIFIED")
          .AddSequence(DicomTags.ReferencedPerformedProcedureStepSequence)
          .AddSequence(DicomTags.PerformedProcedureCodeSequence)
          .Add(DicomTags.ValueType, DicomVR.CS, "CONTAINER")
          .AddSequence(DicomTags.ConceptNameCodeSequence, SegmentationWriter.Code(SrCodes.MeasurementReport))
          .Add(DicomTags.ContinuityOfContent, DicomVR.CS, "SEPARATE")
          .AddSequence(DicomTags.ContentTemplateSequence, new DicomWriteDataset()
              .Add(DicomTags.MappingResource, DicomVR.CS, "DCMR")
              .Add(DicomTags.TemplateIdentifier, DicomVR.CS, "1500"))
          .AddSequence(DicomTags.ContentSequence,
              SrContent.Code("HAS CONCEPT MOD", SrCodes.Language, SrCodes.English),
              SrContent.Code("HAS OBS CONTEXT", SrCodes.ObserverType, SrCodes.Device),
              SrContent.Uid("HAS OBS CONTEXT", SrCodes.DeviceObserverUid, DicomUids.ImplementationClassUid),
              SrContent.Text("HAS OBS CONTEXT", SrCodes.DeviceObserverName, $"{SoftwareInfo.Name} {SoftwareInfo.Version}"),
              SrContent.Code("HAS CONCEPT MOD", SrCodes.ProcedureReported, SrCodes.ProstateMri),
              SrContent.Container("CONTAINS", SrCodes.ImagingMeasurements, [.. groups]));
        if (segs.Count > 0) ds.AddSequence(DicomTags.CurrentRequestedProcedureEvidenceSequence, [.. Evidence(segs)]);
        return ds;
    }

    private static DicomWriteDataset? Group(ChangeReport report, VisitRecord v, string region, string label, string prefix,
        VisitSegReference? seg, string uidRoot)
    {
        var items = new List<DicomWriteDataset>
        {
            SrContent.Text("HAS OBS CONTEXT", SrCodes.TrackingIdentifier, $"{label} visit {v.Index}"),
            SrContent.Uid("HAS OBS CONTEXT", SrCodes.TrackingUid, DicomUids.FromName($"sr-tracking/{region}/{v.Index}/{v.StudyInstanceUid}", uidRoot)),
            SrContent.Text("HAS OBS CONTEXT", SrCodes.TimePoint, v.Index == 0 ? $"baseline {v.Date}" : $"follow-up {v.Index} {v.Date}"),
            region == "prostate"
                ? SrContent.Code("CONTAINS", SrCodes.Finding, DicomCode.Prostate)
                : SrContent.Code("CONTAINS", SrCodes.Finding, DicomCode.Neoplasm),
            SrContent.Code("HAS CONCEPT MOD", SrCodes.FindingSite, DicomCode.Prostate),
        };
        if (seg is not null && seg.SegmentNumbers.TryGetValue(label, out int number))
            items.Add(SrContent.Segment("CONTAINS", SrCodes.ReferencedSegment, seg.Seg.SopInstanceUid, number));
        int measures = 0;
        foreach (var (id, value) in v.Values.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            if (!id.StartsWith(prefix, StringComparison.Ordinal) || value.Value is not { } x || !double.IsFinite(x)) continue;
            var (concept, derivation) = SrCodes.ForMeasure(id);
            var unit = SrCodes.Unit(value.Unit);
            var mods = derivation is null ? [] : new[] { SrContent.Code("HAS CONCEPT MOD", SrCodes.Derivation, derivation) };
            items.Add(SrContent.Num("CONTAINS", concept, Round(x), unit, mods));
            measures++;
            if (report.Changes.FirstOrDefault(c => c.Measure == id && c.ToVisit == v.Index && c.FromVisit == 0) is { } ch)
            {
                items.Add(SrContent.Num("CONTAINS", SrCodes.Local($"{id} change from baseline"), Round(ch.Delta), unit));
                if (ch.Ci95 is [var lo, var hi])
                {
                    items.Add(SrContent.Num("CONTAINS", SrCodes.Local($"{id} change 95% lower"), Round(lo), unit));
                    items.Add(SrContent.Num("CONTAINS", SrCodes.Local($"{id} change 95% upper"), Round(hi), unit));
                }
            }
        }
        return measures == 0 ? null : SrContent.Container("CONTAINS", SrCodes.MeasurementGroup, [.. items]);
    }

    private static IEnumerable<DicomWriteDataset> Evidence(IReadOnlyList<VisitSegReference> segs) =>
        segs.GroupBy(s => s.Seg.StudyInstanceUid, StringComparer.Ordinal).Select(study => new DicomWriteDataset()
            .Add(DicomTags.StudyInstanceUID, DicomVR.UI, study.Key)
            .AddSequence(DicomTags.ReferencedSeriesSequence, [.. study.GroupBy(s => s.Seg.SeriesInstanceUid, StringComparer.Ordinal)
                .Select(series => new DicomWriteDataset()
                    .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, series.Key)
                    .AddSequence(DicomTags.ReferencedSOPSequence, [.. series.Select(s => new DicomWriteDataset()
                        .Add(DicomTags.ReferencedSOPClassUID, DicomVR.UI, s.Seg.SopClassUid)
                        .Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, s.Seg.SopInstanceUid))]))]));

    /// <summary>Ten significant digits: beyond any measurement's precision, within DS's 16 characters.</summary>
    private static double Round(double v) => double.Parse(v.ToString("G10", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
}
