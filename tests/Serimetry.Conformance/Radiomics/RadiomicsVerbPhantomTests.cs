using System.Globalization;
using System.Diagnostics;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Radiomics;

/// <summary>
/// The one-command compliance check: <c>serimetry radiomics</c> on the IBSI digital phantom NIfTI files with
/// the shipped settings reproduces every reference value. Src: IBSI chapter 1 reference values
/// (Zwanenburg et al., Radiology 2020), phantom from theibsi/data_sets (CC BY 4.0).
/// </summary>
public sealed class RadiomicsVerbPhantomTests
{
    [Fact]
    public void Verb_on_the_NIfTI_phantom_reproduces_the_IBSI_reference_values()
    {
        var dir = Directory.CreateTempSubdirectory("serimetry-radiomics-");
        try
        {
            var csv = Path.Combine(dir.FullName, "features.csv");
            var (rc, stderr) = RunCli(
            [
                "radiomics",
                "--image", SharedReference.PathOf("ibsi", "digital_phantom", "nifti", "image", "phantom.nii.gz"),
                "--mask", SharedReference.PathOf("ibsi", "digital_phantom", "nifti", "mask", "mask.nii.gz"),
                "--settings", Path.Combine(SharedReference.RepoRoot, "phantoms", "ibsi-digital-phantom.settings.json"),
                "--out", csv,
            ]);
            Assert.True(rc == 0, stderr);
            var lines = File.ReadAllLines(csv);
            Assert.Equal("family,feature,ibsiCode,aggregationCode,value", lines[0]);
            var rows = lines.Skip(1).Select(l => l.Split(',')).Where(f => f.Length == 5).ToList();
            int pass = 0;
            foreach (var reference in IbsiPhantom.ReferenceRows())
            {
                var hits = rows.Where(f => f[2] == reference.Code && f[3] == reference.EngineAggregationCode).ToList();
                var hit = hits.Count == 1 ? hits[0] : hits.FirstOrDefault(f => f[1] == reference.Feature);
                if (hit is not null && reference.Accepts(double.Parse(hit[4], CultureInfo.InvariantCulture))) pass++;
            }
            Assert.Equal(482, pass);
        }
        finally
        {
            dir.Delete(recursive: true);
        }
    }

    [Fact]
    public void Verb_reports_an_empty_roi_with_exit_code_3()
    {
        var (rc, stderr) = RunCli(
        [
            "radiomics",
            "--image", SharedReference.PathOf("ibsi", "digital_phantom", "nifti", "image", "phantom.nii.gz"),
            "--mask", SharedReference.PathOf("ibsi", "digital_phantom", "nifti", "image", "phantom.nii.gz"),
            "--settings", Path.Combine(SharedReference.RepoRoot, "phantoms", "ibsi-digital-phantom.settings.json"),
            "--label", "200",
            "--out", Path.Combine(Path.GetTempPath(), "serimetry-never-written.csv"),
        ]);
        Assert.Equal(3, rc);
        Assert.Contains("no voxel", stderr);
    }

    [Fact]
    public void Verb_says_how_to_proceed_with_DICOM_input()
    {
        var (rc, stderr) = RunCli(
        [
            "radiomics", "--image", SharedReference.PathOf("dicom"), "--mask", SharedReference.PathOf("dicom"),
            "--out", Path.Combine(Path.GetTempPath(), "serimetry-never-written.csv"),
        ]);
        Assert.Equal(3, rc);
        Assert.Contains("NIfTI", stderr);
    }

    // Runs the built serimetry program (copied beside the tests through the project reference) as a process.
    private static (int ExitCode, string Stderr) RunCli(string[] args)
    {
        var start = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "serimetry.dll"));
        foreach (var a in args) start.ArgumentList.Add(a);
        using var process = Process.Start(start)!;
        var stdoutTask = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEnd();
        process.WaitForExit();
        _ = stdoutTask.Result;
        return (process.ExitCode, stderr);
    }
}
