using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Conformance.Masks;

/// <summary>A small one-visit phantom written as DICOM (T2w series, truth SEG, NIfTI truth masks) for the mask input tests.</summary>
public sealed class MaskPhantomFixture : IDisposable
{
    public MaskPhantomFixture()
    {
        Dir = Directory.CreateTempSubdirectory("serimetry-maskconf-").FullName;
        Subject = PhantomGenerator.Generate(new PhantomSpec() with
        {
            Seed = 8,
            Visits = 1,
            T2Grid = new PhantomGrid(96, 88, 16, 0.8, 0.8, 3.0),
            DwiGrid = new PhantomGrid(40, 36, 16, 2.0, 2.0, 3.0),
            LesionRadiusMm = 6,
        });
        PhantomDicomWriter.Write(Dir, Subject);
        var found = SegSourceResolver.FromExam(Visit) ?? throw new InvalidOperationException("the phantom's T2w series was not found");
        StudyInstanceUid = found.StudyInstanceUid;
        Source = found.Reference;
    }

    public string Dir { get; }

    public PhantomSubject Subject { get; }

    public PhantomVisit V => Subject.Visits[0];

    public string Visit => Path.Combine(Dir, "visit-0");

    public string Masks => Path.Combine(Visit, "masks");

    public string? StudyInstanceUid { get; }

    public SegSourceReference Source { get; }

    public void Dispose() => Directory.Delete(Dir, true);
}
