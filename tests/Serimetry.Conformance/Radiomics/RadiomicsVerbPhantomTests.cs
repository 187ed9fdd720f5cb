using System.Globalization;
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
            var (rc, _, stderr) = ServiceProcess.RunCli(
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
        var (rc, _, stderr) = ServiceProcess.RunCli(
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
    public void Verb_reads_a_DICOM_series_and_says_a_folder_is_no_mask()
    {
        // The image (a DICOM series folder) is read; a folder given as the mask gets a clear input error (docs/masks.md).
        string series = SharedReference.PathOf("dicom", "series-oblique");
        var (rc, _, stderr) = ServiceProcess.RunCli(
        [
            "radiomics", "--image", series, "--mask", series,
            "--out", Path.Combine(Path.GetTempPath(), "serimetry-never-written.csv"),
        ]);
        Assert.Equal(3, rc);
        Assert.Contains("folder", stderr);
    }
}
