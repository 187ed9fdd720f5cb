using Serimetry.Conformance.Dicom;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Reports.Dicom;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.DicomOut;

/// <summary>
/// DICOM phantom exams and SEG outputs against outside truth: the phantom's own volumes (what was written),
/// dcmtk (dcmdump), GDCM (gdcminfo) and dicom3tools (dciodvfy, an IOD validator).
/// </summary>
public sealed class DicomOutputTests(DicomPhantomFixture fx, ITestOutputHelper output) : IClassFixture<DicomPhantomFixture>
{
    private static string First(string dir) => Directory.GetFiles(dir, "*.dcm").Order(StringComparer.Ordinal).First();

    [Fact]
    public void Phantom_exam_reads_back_with_intended_geometry_voxels_and_identifiers()
    {
        foreach (var v in fx.Subject.Visits)
        {
            var exam = DicomExamLoader.Load(fx.Visit(v.Index)).Exam;
            // Src: the phantom's own volumes; tolerance = half a rescale step (PS3.3 C.11.1.1.2).
            Assert.True(exam.T2w.Geometry.IsCongruentWith(v.T2w.Geometry, 1e-3), exam.T2w.Geometry.Describe());
            Assert.True(exam.Adc.Geometry.IsCongruentWith(v.Adc.Geometry, 1e-3), exam.Adc.Geometry.Describe());
            AssertWithinQuantisation(v.T2w.Voxels, exam.T2w.Voxels);
            AssertWithinQuantisation(v.Adc.Voxels, exam.Adc.Voxels);
            Assert.Equal(v.Dwi.Select(d => d.BValue), exam.BValues);
            Assert.Equal(fx.Subject.SubjectId, exam.PatientId);
            Assert.Equal(v.Date, exam.Date);
            Assert.Equal(Engine.Io.AdcSource.Scanner, exam.AdcSource);
        }
        var uids = fx.Subject.Visits.Select(v => DicomExamLoader.Load(fx.Visit(v.Index)).Exam.StudyInstanceUid).ToList();
        Assert.Equal(uids.Count, uids.Distinct().Count());
    }

    [Fact]
    public void Phantom_truth_seg_reproduces_the_truth_masks_and_passes_dciodvfy()
    {
        foreach (var v in fx.Subject.Visits)
        {
            var path = Path.Combine(fx.Visit(v.Index), "masks", "seg.dcm");
            var back = SegmentationReader.Read(path, v.T2w.Geometry);
            Assert.Equal(v.GlandMask.Voxels, back[0].Mask.Voxels); // Src: the generator's own masks
            Assert.Equal(v.LesionMask.Voxels, back[1].Mask.Voxels);
            var (errors, warnings) = Dciodvfy.Check(path);
            foreach (var w in warnings) output.WriteLine($"dciodvfy phantom seg: {w}");
            Assert.True(errors.Count == 0, string.Join('\n', errors));
        }
    }

    [Fact]
    public void Seg_without_source_images_passes_dciodvfy()
    {
        // The NIfTI-exam case: no Referenced Series, no Derivation Image groups, own study and frame of reference.
        var v = fx.Subject.Visits[1];
        var path = Path.Combine(fx.Dir, "seg-no-source.dcm");
        SegmentationWriter.Write(path, v.T2w.Geometry,
            [new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "test", v.GlandMask)],
            new DicomStudyInfo("X", null, null, v.Date), null);
        var (errors, warnings) = Dciodvfy.Check(path);
        foreach (var w in warnings) output.WriteLine($"dciodvfy seg without source: {w}");
        Assert.True(errors.Count == 0, string.Join('\n', errors));
        Assert.Equal(v.GlandMask.Voxels, SegmentationReader.Read(path, v.T2w.Geometry)[0].Mask.Voxels);
    }

    private static void AssertWithinQuantisation(float[] truth, float[] back)
    {
        var (slope, _) = MrSeriesWriter.Rescale(truth);
        double worst = 0;
        for (int i = 0; i < truth.Length; i++) worst = Math.Max(worst, Math.Abs(truth[i] - back[i]));
        Assert.InRange(worst, 0, slope / 2 + 1e-3);
    }

    [Fact]
    public void Dcmtk_gdcm_and_dciodvfy_accept_the_phantom_images()
    {
        var v = fx.Subject.Visits[0];
        foreach (var series in new[] { "t2w", "dwi", "adc" })
        {
            var file = First(Path.Combine(fx.Visit(0), "dicom", series));
            var dump = ReferenceTool.Capture("dcmdump", file);
            Assert.Contains("MRImageStorage", dump, StringComparison.Ordinal);
            Assert.Contains("[ISO_IR 192]", dump, StringComparison.Ordinal);
            Assert.Contains($"[{fx.Subject.SubjectId}]", dump, StringComparison.Ordinal);
            if (series == "dwi") Assert.Contains("DiffusionBValue", dump, StringComparison.Ordinal);
            var info = ReferenceTool.Capture("gdcminfo", file);
            var size = series == "t2w" ? v.T2w.Size : v.Adc.Size;
            Assert.Contains($"Dimensions: ({size.X},{size.Y},1)", info, StringComparison.Ordinal);
            var (errors, warnings) = Dciodvfy.Check(file);
            foreach (var w in warnings) output.WriteLine($"dciodvfy {series}: {w}");
            Assert.True(errors.Count == 0, string.Join('\n', errors));
        }
    }

    [Fact]
    public void Compare_writes_a_valid_seg_per_visit_referencing_the_t2w_series()
    {
        Assert.Contains("seg-0.dcm", fx.Written);
        Assert.Contains("seg-1.dcm", fx.Written);
        Assert.Equal("change.json", fx.Written[^1]);
        foreach (var v in fx.Result.Visits)
        {
            var path = Path.Combine(fx.OutDir, $"seg-{v.Index}.dcm");
            var (errors, warnings) = Dciodvfy.Check(path);
            foreach (var w in warnings) output.WriteLine($"dciodvfy seg-{v.Index}: {w}");
            Assert.True(errors.Count == 0, string.Join('\n', errors));
            Assert.Contains("SegmentationStorage", ReferenceTool.Capture("dcmdump", path), StringComparison.Ordinal);
            Assert.Contains("Segmentation Storage", ReferenceTool.Capture("gdcminfo", path), StringComparison.Ordinal);

            // Reading our SEG back onto the visit's T2w grid reproduces the masks voxel for voxel.
            var back = SegmentationReader.Read(path, v.Exam.T2w.Geometry);
            Assert.Equal(["Prostate", "Lesion"], back.Select(s => s.Label));
            Assert.Equal(v.Gland!.Voxels, back[0].Mask.Voxels);
            Assert.Equal((v.Lesion?.Mask ?? v.PropagatedLesion)!.Voxels, back[1].Mask.Voxels);

            // Same study as the visit; the referenced series is the T2w series the loader picked.
            var ds = DicomFile.Read(path).Dataset;
            Assert.Equal(v.Exam.StudyInstanceUid, ds.GetString(DicomTags.StudyInstanceUID));
            var t2File = DicomFile.ReadHeader(First(Path.Combine(fx.Visit(v.Index), "dicom", "t2w"))).Dataset;
            var referenced = Assert.Single(ds.GetSequence(DicomTags.ReferencedSeriesSequence));
            Assert.Equal(t2File.GetString(DicomTags.SeriesInstanceUID), referenced.GetString(DicomTags.SeriesInstanceUID));
            Assert.Equal(v.Exam.T2w.Size.Z, referenced.GetSequence(DicomTags.ReferencedInstanceSequence).Count);
            Assert.Equal(t2File.GetString(DicomTags.FrameOfReferenceUID), ds.GetString(DicomTags.FrameOfReferenceUID));
        }
    }

    [Fact]
    public void Compare_writes_a_tid1500_sr_that_dciodvfy_accepts_and_dsrdump_renders()
    {
        Assert.Contains("sr.dcm", fx.Written);
        var path = Path.Combine(fx.OutDir, "sr.dcm");
        var (errors, warnings) = Dciodvfy.Check(path);
        foreach (var w in warnings.Distinct()) output.WriteLine($"dciodvfy sr: {w}");
        Assert.True(errors.Count == 0, string.Join('\n', errors));
        var tree = ReferenceTool.Capture("dsrdump", path);
        Assert.Contains("Imaging Measurement Report", tree, StringComparison.Ordinal);
        Assert.Contains("Referenced Segment", tree, StringComparison.Ordinal);

        // The lesion volume of each visit in the SR equals change.json's value (Src: our own report; 10 significant digits).
        var root = DicomFile.Read(path).Dataset;
        Assert.Equal("1500", root.GetSequence(DicomTags.ContentTemplateSequence).Single().GetString(DicomTags.TemplateIdentifier));
        // The SR files under the patient and latest study of the DICOM images.
        var lastT2 = DicomFile.ReadHeader(First(Path.Combine(fx.Visit(1), "dicom", "t2w"))).Dataset;
        Assert.Equal(lastT2.GetString(DicomTags.PatientName), root.GetString(DicomTags.PatientName));
        Assert.Equal(lastT2.GetString(DicomTags.StudyInstanceUID), root.GetString(DicomTags.StudyInstanceUID));
        var groups = root.GetSequence(DicomTags.ContentSequence)
            .Single(i => Meaning(i) == "Imaging Measurements").GetSequence(DicomTags.ContentSequence);
        Assert.Equal(2 * fx.Result.Visits.Count, groups.Count);
        foreach (var v in fx.Result.Report.Visits)
        {
            var lesion = groups.Single(g => g.GetSequence(DicomTags.ContentSequence)
                .Any(i => Meaning(i) == "Tracking Identifier" && i.GetString(DicomTags.TextValue) == $"Lesion visit {v.Index}"));
            var volume = lesion.GetSequence(DicomTags.ContentSequence).Single(i => Meaning(i) == "Volume");
            var measured = volume.GetSequence(DicomTags.MeasuredValueSequence).Single();
            Assert.Equal(v.Values["lesion.volume"].Value!.Value, measured.GetDouble(DicomTags.NumericValue), 1e-8);
            Assert.Equal("ml", measured.GetSequence(DicomTags.MeasurementUnitsCodeSequence).Single().GetString(DicomTags.CodeValue));
            // The segment reference points at this visit's SEG.
            var segRef = lesion.GetSequence(DicomTags.ContentSequence).Single(i => Meaning(i) == "Referenced Segment")
                .GetSequence(DicomTags.ReferencedSOPSequence).Single();
            var seg = DicomFile.ReadHeader(Path.Combine(fx.OutDir, $"seg-{v.Index}.dcm")).Dataset;
            Assert.Equal(seg.GetString(DicomTags.SOPInstanceUID), segRef.GetString(DicomTags.ReferencedSOPInstanceUID));
            Assert.Equal(2, segRef.GetInt(DicomTags.ReferencedSegmentNumber));
        }
    }

    private static string Meaning(DicomDataset item) =>
        item.GetSequence(DicomTags.ConceptNameCodeSequence).FirstOrDefault()?.GetStringOrNull(DicomTags.CodeMeaning) ?? "";
}
