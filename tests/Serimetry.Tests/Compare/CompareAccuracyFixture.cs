using Serimetry.Engine.Change;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Tests.Compare;

/// <summary>One seeded phantom pair compared end to end, with its truth beside the measured values.</summary>
/// <param name="Name">Seed and exam format, for messages.</param>
/// <param name="Growth">True lesion volume factor baseline → follow-up.</param>
/// <param name="TrueVolumeMl">Analytic lesion volume per visit (truth.json lesionVolumeMl).</param>
/// <param name="Values">Measured value per visit and measure id.</param>
/// <param name="FollowupDice">Dice of the re-fitted follow-up lesion against the true follow-up lesion.</param>
/// <param name="Changes">Baseline → follow-up changes.</param>
public sealed record AccuracyCase(string Name, double Growth, double[] TrueVolumeMl, IReadOnlyList<IReadOnlyDictionary<string, double?>> Values,
    double FollowupDice, IReadOnlyList<MeasureChange> Changes)
{
    public double Ratio(string id) => Values[1][id]!.Value / Values[0][id]!.Value;

    public MeasureChange Change(string id) => Changes.Single(c => c.Measure == id);
}

/// <summary>
/// A seeded set of phantom subjects (Src: the phantom generator's analytic anatomy, exact rigid motion and lesion
/// growth, truth.json), each a baseline and one follow-up, compared through the whole pipeline: ten written as
/// NIfTI exams and the same ten specs (new seeds) written as DICOM series and read by the DICOM exam loader.
/// Fields of view are cropped around the gland and the ADC is on a 1.5 × 1.5 × 3 mm grid (a 128² clinical matrix)
/// to keep the set small; the lesions are 0.5-1.2 mL at baseline. Run once and shared by the accuracy tests.
/// </summary>
public sealed class CompareAccuracyFixture : IDisposable
{
    /// <summary>(seed offset, baseline lesion radius mm, growth): three no-change re-acquisitions, growth 1.25-2.2.</summary>
    private static readonly (int Seed, double RadiusMm, double Growth)[] Subjects =
    [
        (0, 6.0, 1.0), (1, 6.5, 1.0), (2, 5.0, 1.0), (3, 6.0, 1.25), (4, 5.5, 1.5),
        (5, 6.5, 1.6), (6, 5.0, 1.8), (7, 6.0, 2.0), (8, 5.5, 2.2), (9, 6.0, 2.2),
    ];

    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-accuracy-").FullName;

    public CompareAccuracyFixture()
    {
        Nifti = Subjects.Select(s => Run(Spec(400 + s.Seed, s.RadiusMm, s.Growth), dicom: false)).ToList();
        Dicom = Subjects.Select(s => Run(Spec(500 + s.Seed, s.RadiusMm, s.Growth), dicom: true)).ToList();
    }

    public IReadOnlyList<AccuracyCase> Nifti { get; }

    public IReadOnlyList<AccuracyCase> Dicom { get; }

    public IEnumerable<AccuracyCase> All => Nifti.Concat(Dicom);

    public void Dispose()
    {
        if (Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    internal static PhantomSpec Spec(int seed, double radiusMm, double growth) => new PhantomSpec() with
    {
        Seed = seed,
        Visits = 2,
        GrowthPerVisit = growth,
        LesionRadiusMm = radiusMm,
        MaxRotateDeg = 5,
        MaxShiftMm = 6,
        T2Grid = new PhantomGrid(128, 112, 20, 0.6, 0.6, 3.0),
        DwiGrid = new PhantomGrid(52, 46, 20, 1.5, 1.5, 3.0),
        PsaNgPerMl = [5.0, 5.5],
    };

    private AccuracyCase Run(PhantomSpec spec, bool dicom)
    {
        var subject = PhantomGenerator.Generate(spec);
        string name = $"seed {spec.Seed} ({(dicom ? "DICOM" : "NIfTI")})";
        var dir = Path.Combine(_dir, $"s{spec.Seed}");
        if (dicom) PhantomDicomWriter.Write(dir, subject);
        else PhantomWriter.WriteNifti(dir, subject);
        string Visit(int k) => Path.Combine(dir, $"visit-{k}");
        var request = new CompareRequest(Visit(0), [Visit(1)], Path.Combine(Visit(0), "masks", "gland.nii.gz"),
            Path.Combine(Visit(0), "masks", "lesion.nii.gz"), [], RepeatabilityProfile.LoadDefault(), new ComparisonOptions());
        var result = ComparePipeline.Run(request);
        if (result.Report.Partial) throw new InvalidOperationException($"{name}: {string.Join("; ", result.Report.Problems)}");
        var truthLesion = MaskOps.Binarize(subject.Visits[1].LesionMask);
        double dice = MaskOps.Dice(result.Visits[1].Lesion!.Mask, truthLesion);
        var values = result.Report.Visits.Select(v => (IReadOnlyDictionary<string, double?>)v.Values.ToDictionary(p => p.Key, p => p.Value.Value)).ToList();
        var changes = result.Report.Changes.Where(c => c.FromVisit == 0 && c.ToVisit == 1).ToList();
        Directory.Delete(dir, recursive: true);
        return new AccuracyCase(name, spec.GrowthPerVisit, subject.Visits.Select(v => v.Truth.LesionVolumeMl).ToArray(), values, dice, changes);
    }
}
