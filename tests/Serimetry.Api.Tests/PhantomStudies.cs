using System.IO.Compression;
using Serimetry.Engine.Change;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Reports;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Api.Tests;

/// <summary>
/// Two visits of a small digital phantom (known truth: PhantomGenerator), written as NIfTI exams and zipped,
/// made once per test run. The patient id is a distinctive string so the log checks can grep for it.
/// </summary>
internal static class PhantomStudies
{
    public const string PatientId = "PHI-SUBJ-73X1";

    private static readonly Lazy<string> Dir = new(Make);

    public static string Root => Dir.Value;

    public static string Visit(int k) => Path.Combine(Root, $"visit-{k}");

    public static byte[] VisitZip(int k) => File.ReadAllBytes(Path.Combine(Root, $"visit-{k}.zip"));

    public static byte[] BaselineMask(string name) => File.ReadAllBytes(Path.Combine(Visit(0), "masks", name + ".nii.gz"));

    public static readonly IReadOnlyList<PsaSample> Psa = [new(new DateOnly(2022, 3, 14), 5.1), new(new DateOnly(2023, 9, 14), 5.8)];

    private static string Make()
    {
        var spec = PhantomCache.TwoVisits(PatientId, seed: 11);
        return PhantomCache.Folder("api-phantom", spec, "visit-1.zip", tmp =>
        {
            PhantomWriter.WriteNifti(tmp, PhantomGenerator.Generate(spec));
            for (int k = 0; k < 2; k++)
                ZipFile.CreateFromDirectory(Path.Combine(tmp, $"visit-{k}"), Path.Combine(tmp, $"visit-{k}.zip"));
        });
    }

    private static readonly Lazy<string> Reference = new(() =>
    {
        // Src: the engine itself, called as 'serimetry compare' calls it (same defaults), is the reference for the service.
        var request = new CompareRequest(Visit(0), [Visit(1)], Path.Combine(Visit(0), "masks", "gland.nii.gz"),
            Path.Combine(Visit(0), "masks", "lesion.nii.gz"), Psa, RepeatabilityProfile.LoadDefault(),
            new ComparisonOptions(Radiomics: new RadiomicsSettings()));
        return ChangeReportJson.Serialize(ComparePipeline.Run(request).Report);
    });

    /// <summary>change.json of the engine run directly on the phantom files.</summary>
    public static string ReferenceChangeJson => Reference.Value;
}
