using Serimetry.Cli;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Reports.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Cli;

/// <summary>
/// <c>serimetry radiomics</c> with a DICOM T2w series as the image and the ROI given as NIfTI, DICOM SEG or
/// RTSTRUCT (Src: the NIfTI run is the reference; docs/masks.md says the three carry the same ROI).
/// </summary>
public sealed class RadiomicsMaskInputTests : IDisposable
{
    private readonly ScratchFolder _tmp = new("serimetry-radmask-");

    public void Dispose() => _tmp.Dispose();

    private static string Run(string image, string mask, string csv)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        Assert.True(CliHost.Run(["radiomics", "--image", image, "--mask", mask, "--out", csv], o, e) == 0, e.ToString());
        return File.ReadAllText(csv);
    }

    [Fact]
    public void Nifti_seg_and_rtstruct_masks_give_the_same_features()
    {
        var subject = PhantomGenerator.Generate(new PhantomSpec() with
        {
            Seed = 5,
            Visits = 1,
            T2Grid = new PhantomGrid(64, 60, 12, 1.0, 1.0, 3.0),
            DwiGrid = new PhantomGrid(32, 30, 12, 2.0, 2.0, 3.0),
            LesionRadiusMm = 6,
        });
        PhantomDicomWriter.Write(_tmp.Dir, subject);
        string visit = _tmp.PathOf("visit-0");
        var v = subject.Visits[0];
        var source = SegSourceResolver.FromExam(visit)!.Value;
        string rt = _tmp.PathOf("rt.dcm");
        RtStructWriter.Write(rt, v.T2w.Geometry, [new RoiDefinition("Prostate", v.GlandMask), new RoiDefinition("Lesion", v.LesionMask, "GTV")],
            new DicomStudyInfo(subject.SubjectId, null, source.StudyInstanceUid, v.Date), source.Reference);
        string t2 = Path.Combine(visit, "dicom", "t2w");
        string fromNifti = Run(t2, Path.Combine(visit, "masks", "lesion.nii.gz"), _tmp.PathOf("nifti.csv"));
        Assert.Equal(fromNifti, Run(t2, Path.Combine(visit, "masks", "seg.dcm") + "#Lesion", _tmp.PathOf("seg.csv")));
        Assert.Equal(fromNifti, Run(t2, rt + "#Lesion", _tmp.PathOf("rt.csv")));
        Assert.Contains("morphology", fromNifti, StringComparison.OrdinalIgnoreCase);
    }
}
