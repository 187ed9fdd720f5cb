using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Imaging;
using Xunit;

namespace Serimetry.Tests.Io.Nifti;

public sealed class NiftiInspectorTests : IDisposable
{
    private readonly NiftiTestFiles _files = new();

    public void Dispose() => _files.Dispose();

    [Fact]
    public void SummaryGivesLpsGeometryAndRoleOther()
    {
        var g = TestGrids.Oblique(new Size3(7, 6, 5), leftHanded: true);
        var path = _files.PathOf("t2.nii.gz");
        NiftiFile.Write(path, TestGrids.Random(g, 3));
        var study = NiftiInspector.Summarize(path);
        var s = Assert.Single(study.Series);
        Assert.Equal(SeriesRole.Other, s.Role);
        Assert.Equal("t2", s.SeriesInstanceUid);
        Assert.Equal(g.Size, s.Size);
        Assert.True((s.OriginMm - g.OriginMm).Norm < 1e-4);
        Assert.True((s.SpacingMm - g.SpacingMm).Norm < 1e-5);
        Assert.True(s.Direction.MaxAbsDifference(g.Direction) < 1e-5);
        Assert.Empty(s.BValues);
        Assert.Null(study.PatientId);
        Assert.Equal(SeriesRole.T2w, NiftiInspector.Summarize(path, SeriesRole.T2w).Series[0].Role);
    }

    // Src: common practice (FSL-style .bval sidecar: one b-value per volume, whitespace-separated).
    [Fact]
    public void BvalSidecarMakesADwiSeries()
    {
        var g = Geometry.Axial(new Size3(4, 4, 2), new Vec3(2, 2, 3), Vec3.Zero);
        var path = _files.PathOf("dwi.nii");
        NiftiFile.Write(path, [new Volume<float>(g), new Volume<float>(g), new Volume<float>(g)]);
        File.WriteAllText(_files.PathOf("dwi.bval"), "0 800 50\n");
        var s = NiftiInspector.Summarize(path).Series[0];
        Assert.Equal(SeriesRole.Dwi, s.Role);
        Assert.Equal(new double[] { 0, 50, 800 }, s.BValues);
        File.WriteAllText(_files.PathOf("dwi.bval"), "0 800\n");
        var mismatched = NiftiInspector.Summarize(path).Series[0];
        Assert.Equal(SeriesRole.Other, mismatched.Role);
        Assert.Contains(mismatched.Warnings, w => w.Contains("2 b-values for 3 volume"));
    }
}
