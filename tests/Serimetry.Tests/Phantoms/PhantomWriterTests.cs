using System.Text.Json;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Phantoms;
using Xunit;

namespace Serimetry.Tests.Phantoms;

public sealed class PhantomWriterTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-phantom-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    [Fact]
    public void NiftiExamsReadBackWithTheirGeometryAndManifest()
    {
        var spec = new PhantomSpec
        {
            Visits = 2,
            T2Grid = new PhantomGrid(48, 40, 10, 1.5, 1.5, 3),
            DwiGrid = new PhantomGrid(24, 20, 10, 3, 3, 3),
        };
        var subject = PhantomGenerator.Generate(spec);
        PhantomWriter.WriteNifti(_dir, subject);
        var visit = subject.Visits[1];
        var t2 = NiftiFile.Read(Path.Combine(_dir, "visit-1", "t2w.nii.gz")).Volume;
        Assert.True(t2.Geometry.IsCongruentWith(visit.T2w.Geometry, 1e-3), $"{t2.Geometry} vs {visit.T2w.Geometry}");
        Assert.Equal(visit.T2w.Voxels, t2.Voxels);
        var lesion = NiftiFile.ReadMask(Path.Combine(_dir, "visit-1", "masks", "lesion.nii.gz"));
        Assert.Equal(visit.LesionMask.Voxels, lesion.Voxels);
        var b800 = NiftiFile.Read(Path.Combine(_dir, "visit-1", "b800.nii.gz")).Volume;
        Assert.True(b800.Geometry.IsCongruentWith(visit.Dwi[2].Image.Geometry, 1e-3));

        using var exam = JsonDocument.Parse(File.ReadAllText(Path.Combine(_dir, "visit-1", "exam.json")));
        Assert.Equal("NSC-0007", exam.RootElement.GetProperty("patientId").GetString());
        Assert.Equal("2023-09-14", exam.RootElement.GetProperty("date").GetString());
        Assert.Equal("b1400.nii.gz", exam.RootElement.GetProperty("series").GetProperty("dwi").GetProperty("1400").GetString());
        Assert.True(File.Exists(Path.Combine(_dir, "truth.json")));
        Assert.Equal(spec.ToJson(), PhantomSpec.Load(Path.Combine(_dir, "spec.json")).ToJson());
    }
}
