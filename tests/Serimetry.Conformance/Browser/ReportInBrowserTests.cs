using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Browser;

/// <summary>
/// The HTML report in a real browser (Src: Debian's chromium, driven over the Chrome DevTools Protocol): it
/// renders with no console or network errors and every picture decodes. A screenshot is kept under
/// artifacts/test-results/ as a test artefact (not in git).
/// </summary>
public sealed class ReportInBrowserTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-report-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private string WriteReport()
    {
        var spec = new PhantomSpec() with
        {
            Visits = 2,
            T2Grid = new PhantomGrid(100, 80, 14, 1.0, 1.0, 3.0),
            DwiGrid = new PhantomGrid(50, 40, 14, 2.0, 2.0, 3.0),
            PsaNgPerMl = [5.0, 5.5],
        };
        var exams = Path.Combine(_dir, "exams");
        PhantomWriter.WriteNifti(exams, PhantomGenerator.Generate(spec));
        var request = new CompareRequest(Path.Combine(exams, "visit-0"), [Path.Combine(exams, "visit-1")],
            Path.Combine(exams, "visit-0", "masks", "gland.nii.gz"), Path.Combine(exams, "visit-0", "masks", "lesion.nii.gz"),
            [], RepeatabilityProfile.LoadDefault(), new ComparisonOptions());
        var outDir = Path.Combine(_dir, "result");
        CompareOutputs.Write(ComparePipeline.Run(request), outDir);
        return Path.Combine(outDir, "report.html");
    }

    [Fact]
    public void ReportRendersWithoutErrorsAndAllPicturesLoad()
    {
        Assert.True(File.Exists(HeadlessChromium.Executable), "chromium is missing: scripts/test.sh installs Debian's chromium");
        var report = WriteReport();
        var check = HeadlessChromium.Load(report, TimeSpan.FromSeconds(90));
        var artefacts = Path.Combine(SharedReference.RepoRoot, "artifacts", "test-results");
        Directory.CreateDirectory(artefacts);
        File.WriteAllBytes(Path.Combine(artefacts, "report-screenshot.png"), check.Screenshot);
        Assert.Empty(check.Errors);
        Assert.Equal(4, check.Images);
        Assert.Equal(0, check.BrokenImages);

        // The check can fail: with one picture removed the browser reports it.
        File.Delete(Path.Combine(Path.GetDirectoryName(report)!, "visit-1-adc.png"));
        var broken = HeadlessChromium.Load(report, TimeSpan.FromSeconds(90));
        Assert.Equal(1, broken.BrokenImages);
        Assert.NotEmpty(broken.Errors);
    }
}
