using Serimetry.Conformance.Dicom;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Reports.Dicom;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.DicomOut;

/// <summary>
/// Keeps fixed dciodvfy warnings from coming back. Reference: dicom3tools' dciodvfy (Debian package
/// dicom3tools), an independent IOD validator; the accepted remaining warnings are listed in docs/dicom-out.md.
/// </summary>
public sealed class DciodvfyWarningTests(DicomPhantomFixture fx, ITestOutputHelper output) : IClassFixture<DicomPhantomFixture>
{
    /// <summary>The warning dciodvfy gives for an empty or absent Type 2 Study ID / Study Time.</summary>
    private const string DicomdirWarning = "needed to build DICOMDIR";

    /// <summary>The only SR warning we accept: dciodvfy knows registered coding schemes only (PS3.3 8.2: "99" = private).</summary>
    private const string PrivateSchemeWarning = "Warning - Unrecognized defined term <99SRMT> for value 1 of attribute <Coding Scheme Designator>";

    private IReadOnlyList<string> Warnings(string label, string path)
    {
        var (errors, warnings) = Dciodvfy.Check(path);
        Assert.True(errors.Count == 0, string.Join('\n', errors));
        foreach (var w in warnings.Distinct()) output.WriteLine($"dciodvfy {label}: {w}");
        return warnings;
    }

    private DicomDataset FirstT2w(int visit) =>
        DicomFile.ReadHeader(Directory.GetFiles(Path.Combine(fx.Visit(visit), "dicom", "t2w"), "*.dcm").Order(StringComparer.Ordinal).First()).Dataset;

    [Fact]
    public void Seg_and_sr_of_a_dicom_exam_carry_its_study_id_and_time()
    {
        foreach (var v in fx.Result.Visits)
        {
            var path = Path.Combine(fx.OutDir, $"seg-{v.Index}.dcm");
            Assert.DoesNotContain(Warnings($"seg-{v.Index}", path), w => w.Contains(DicomdirWarning, StringComparison.Ordinal));
            AssertSameStudyIdAndTime(FirstT2w(v.Index), DicomFile.Read(path).Dataset);
        }
        var sr = Path.Combine(fx.OutDir, "sr.dcm");
        Assert.DoesNotContain(Warnings("sr", sr), w => w.Contains(DicomdirWarning, StringComparison.Ordinal));
        AssertSameStudyIdAndTime(FirstT2w(fx.Result.Visits[^1].Index), DicomFile.Read(sr).Dataset);
        for (int k = 0; k < fx.Subject.Visits.Count; k++)
        {
            var seg = Path.Combine(fx.Visit(k), "masks", "seg.dcm");
            Assert.DoesNotContain(Warnings($"phantom seg {k}", seg), w => w.Contains(DicomdirWarning, StringComparison.Ordinal));
        }
    }

    [Fact]
    public void Rtstruct_on_a_dicom_exam_has_no_warnings()
    {
        var source = SegSourceResolver.FromExam(fx.Visit(0)) ?? throw new InvalidOperationException("no T2w reference");
        var v = fx.Subject.Visits[0];
        var path = Path.Combine(fx.Dir, "rtstruct-warnings.dcm");
        RtStructWriter.Write(path, v.T2w.Geometry, [new RoiDefinition("Prostate", v.GlandMask)],
            new DicomStudyInfo(fx.Subject.SubjectId, null, source.StudyInstanceUid, v.Date), source.Reference);
        Assert.Empty(Warnings("rtstruct", path));
        AssertSameStudyIdAndTime(FirstT2w(0), DicomFile.Read(path).Dataset);
    }

    [Fact]
    public void Sr_warns_only_about_the_declared_private_coding_scheme()
    {
        var path = Path.Combine(fx.OutDir, "sr.dcm");
        var warnings = Warnings("sr", path);
        Assert.NotEmpty(warnings); // the SR does use local codes, so the accepted warning must be there
        Assert.All(warnings, w => Assert.Equal(PrivateSchemeWarning, w));

        // PS3.3 8.2: private designators begin with "99"; PS3.3 C.12.1.1.2: each is identified in (0008,0110).
        var item = Assert.Single(DicomFile.Read(path).Dataset.GetSequence(DicomTags.CodingSchemeIdentificationSequence));
        Assert.Equal("99SRMT", item.GetString(DicomTags.CodingSchemeDesignator));
        Assert.StartsWith("99", item.GetString(DicomTags.CodingSchemeDesignator), StringComparison.Ordinal);
        Assert.False(string.IsNullOrWhiteSpace(item.GetStringOrNull(DicomTags.CodingSchemeName)));
        Assert.Equal(Engine.Reports.ChangeReportJson.SchemaVersion, item.GetString(DicomTags.CodingSchemeVersion));
        Assert.False(string.IsNullOrWhiteSpace(item.GetStringOrNull(DicomTags.CodingSchemeResponsibleOrganization)));
        Assert.Null(item.GetStringOrNull(DicomTags.CodingSchemeRegistry)); // not a registered scheme
        Assert.Contains("(0008,0116) ST [Serimetry project]", ReferenceTool.Capture("dcmdump", path), StringComparison.Ordinal); // Src: dcmtk
    }

    [Fact]
    public void Mr_images_warn_only_about_the_documented_extensions()
    {
        // docs/dicom-out.md: Rescale Slope/Intercept (float data) and Diffusion b-value (0018,9087) are kept on purpose.
        string[] accepted =
        [
            "(0x0028,0x1052) DS Rescale Intercept", "(0x0028,0x1053) DS Rescale Slope", "(0x0018,0x9087) FD Diffusion b-value",
            "Non-identity Modality LUT Module", "this is a Standard Extended SOP Class",
        ];
        foreach (var series in new[] { "t2w", "dwi", "adc" })
        {
            var file = Directory.GetFiles(Path.Combine(fx.Visit(0), "dicom", series), "*.dcm").Order(StringComparer.Ordinal).First();
            foreach (var w in Warnings(series, file))
                Assert.True(accepted.Any(a => w.Contains(a, StringComparison.Ordinal)), $"{series}: unexpected dciodvfy warning: {w}");
        }
    }

    [Fact]
    public void Mr_image_of_whole_numbers_has_no_modality_lut_and_no_warnings()
    {
        // Classic MR Image IOD (PS3.3 A.4) has no Modality LUT module: values that fit 0…65535 are stored as they are.
        var v = fx.Subject.Visits[0];
        var whole = v.T2w.Clone();
        for (int i = 0; i < whole.Voxels.Length; i++) whole.Voxels[i] = MathF.Round(Math.Clamp(whole.Voxels[i], 0, 65535));
        var dir = Path.Combine(fx.Dir, "mr-whole");
        Engine.Phantoms.PhantomDicomWriter.WriteVisit(dir, fx.Subject, v with { T2w = whole }, DicomUids.UuidRoot);
        var file = Directory.GetFiles(Path.Combine(dir, "t2w"), "*.dcm").Order(StringComparer.Ordinal).First();
        Assert.Empty(Warnings("t2w whole numbers", file));
        var back = DicomFile.Read(file).Dataset;
        Assert.Null(back.GetStringOrNull(DicomTags.RescaleSlope));
        Assert.Null(back.GetStringOrNull(DicomTags.RescaleIntercept));
        Assert.Equal(whole.Voxels, Engine.Exams.DicomExamLoader.Load(dir).Exam.T2w.Voxels); // lossless, read by our own reader
    }

    private static void AssertSameStudyIdAndTime(DicomDataset source, DicomDataset written)
    {
        Assert.False(string.IsNullOrWhiteSpace(source.GetStringOrNull(DicomTags.StudyID)));
        Assert.Equal(source.GetString(DicomTags.StudyID).Trim(), written.GetString(DicomTags.StudyID).Trim());
        Assert.Equal(source.GetString(DicomTags.StudyTime).Trim(), written.GetString(DicomTags.StudyTime).Trim());
    }
}
