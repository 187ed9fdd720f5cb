using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Conformance.DicomOut;

/// <summary>A small two-visit phantom written as DICOM, and a comparison run on it (shared by the DICOM output tests).</summary>
public sealed class DicomPhantomFixture : IDisposable
{
    public DicomPhantomFixture()
    {
        Dir = Directory.CreateTempSubdirectory("serimetry-dcmout-").FullName;
        var spec = new PhantomSpec() with
        {
            Seed = 21,
            Visits = 2,
            GrowthPerVisit = 1.5,
            MaxRotateDeg = 5,
            MaxShiftMm = 6,
            T2Grid = new PhantomGrid(120, 110, 20, 0.75, 0.75, 3.0),
            DwiGrid = new PhantomGrid(48, 44, 20, 2.0, 2.0, 3.0),
            LesionRadiusMm = 6.5,
        };
        Subject = PhantomGenerator.Generate(spec);
        PhantomDicomWriter.Write(Dir, Subject);
        var request = new CompareRequest(Visit(0), [Visit(1)], Path.Combine(Visit(0), "masks", "gland.nii.gz"),
            Path.Combine(Visit(0), "masks", "lesion.nii.gz"), [], RepeatabilityProfile.LoadDefault(), new ComparisonOptions());
        Result = ComparePipeline.Run(request);
        OutDir = Path.Combine(Dir, "out");
        Written = CompareOutputs.Write(Result, OutDir);
    }

    public string Dir { get; }

    public PhantomSubject Subject { get; }

    internal CompareResult Result { get; }

    public string OutDir { get; }

    public IReadOnlyList<string> Written { get; }

    public string Visit(int k) => Path.Combine(Dir, $"visit-{k}");

    public void Dispose() => Directory.Delete(Dir, true);
}
