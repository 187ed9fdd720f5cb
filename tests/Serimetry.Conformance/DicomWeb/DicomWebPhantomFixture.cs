using Serimetry.Engine.Phantoms;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.DicomWeb;

/// <summary>
/// Orthanc running (<see cref="OrthancServer"/>) and a small two-visit phantom written as DICOM exams
/// (<see cref="PhantomDicomWriter"/>: visit-&lt;k&gt;/dicom/ holds the exam, visit-&lt;k&gt;/masks/ the truth outlines).
/// </summary>
public sealed class DicomWebPhantomFixture : IDisposable
{
    public DicomWebPhantomFixture()
    {
        Dir = Directory.CreateTempSubdirectory("serimetry-dicomweb-test-").FullName;
        Subject = PhantomGenerator.Generate(new PhantomSpec() with
        {
            SubjectId = "NSC-0042",
            Seed = 17,
            Visits = 2,
            GrowthPerVisit = 1.4,
            T2Grid = new PhantomGrid(100, 80, 14, 1.0, 1.0, 3.0),
            DwiGrid = new PhantomGrid(50, 40, 14, 2.0, 2.0, 3.0),
        });
        PhantomDicomWriter.Write(Dir, Subject);
        Server = new OrthancServer();
    }

    public string Dir { get; }

    public PhantomSubject Subject { get; }

    public OrthancServer Server { get; }

    /// <summary>The exam folder of visit k (DICOM files only).</summary>
    public string Exam(int k) => Path.Combine(Dir, $"visit-{k}", "dicom");

    /// <summary>A baseline truth mask (NIfTI) of the phantom.</summary>
    public string BaselineMask(string name) => Path.Combine(Dir, "visit-0", "masks", name + ".nii.gz");

    public void Dispose()
    {
        Server.Dispose();
        Directory.Delete(Dir, recursive: true);
    }
}
