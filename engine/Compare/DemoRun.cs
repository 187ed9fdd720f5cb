using Serimetry.Engine.Change;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Compare;

/// <summary>What the demo produced: the invented subject with its truth, and the comparison of its visits.</summary>
public sealed record DemoResult(PhantomSubject Subject, CompareResult Comparison, string ExamsFolder, string ResultFolder);

/// <summary>
/// The demo: generates the invented demo subject (3 visits of the fictional Northfield Surveillance Clinic,
/// a growing lesion, motion between visits), writes it as NIfTI exams, and runs the comparison on it with the
/// baseline outlines only, so every number can be checked against the truth it was built from.
/// </summary>
public static class DemoRun
{
    public static DemoResult Run(string outDir, PhantomSpec spec, IProgress<CompareProgress>? progress = null, int maxThreads = -1)
    {
        progress?.Report(new CompareProgress("generating the demo subject", 0));
        var subject = PhantomGenerator.Generate(spec, maxThreads);
        string exams = Path.Combine(outDir, "exams");
        PhantomWriter.WriteNifti(exams, subject);
        string Visit(int k) => Path.Combine(exams, $"visit-{k}");
        var psa = subject.Visits.Where(v => v.Truth.PsaNgPerMl is not null)
            .Select(v => new PsaSample(v.Date, v.Truth.PsaNgPerMl!.Value)).ToList();
        var request = new CompareRequest(
            Visit(0),
            subject.Visits.Skip(1).Select(v => Visit(v.Index)).ToList(),
            Path.Combine(Visit(0), "masks", "gland.nii.gz"),
            Path.Combine(Visit(0), "masks", "lesion.nii.gz"),
            psa,
            RepeatabilityProfile.LoadDefault(),
            new ComparisonOptions(MaxThreads: maxThreads, Radiomics: new Radiomics.RadiomicsSettings()));
        var result = ComparePipeline.Run(request, progress);
        CompareOutputs.Write(result, outDir);
        return new DemoResult(subject, result, exams, outDir);
    }
}
