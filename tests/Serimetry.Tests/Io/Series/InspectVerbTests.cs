using Serimetry.Tests.Cli;
using System.Text.Json;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.Series;

public sealed class InspectVerbTests : IDisposable
{
    private readonly string _tmp = Directory.CreateTempSubdirectory("serimetry-inspect-").FullName;

    public void Dispose() => Directory.Delete(_tmp, true);

    private static (int Code, string Out, string Err) Run(params string[] args) => CliRun.Run(args);

    [Fact]
    public void FolderJsonHasTheContractShape()
    {
        var (code, output, _) = Run("inspect", SharedReference.PathOf("mr", "ProstateX-0000"), "--json");
        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(output);
        var study = Assert.Single(doc.RootElement.GetProperty("studies").EnumerateArray());
        foreach (var key in new[] { "studyInstanceUid", "patientId", "studyDate", "series" })
            Assert.True(study.TryGetProperty(key, out _), key);
        var roles = new List<string>();
        foreach (var s in study.GetProperty("series").EnumerateArray())
        {
            Assert.Equal(3, s.GetProperty("size").GetArrayLength());
            Assert.Equal(3, s.GetProperty("spacing").GetArrayLength());
            Assert.Equal(3, s.GetProperty("origin").GetArrayLength());
            Assert.Equal(9, s.GetProperty("direction").GetArrayLength());
            Assert.Equal(JsonValueKind.Array, s.GetProperty("bValues").ValueKind);
            Assert.False(string.IsNullOrEmpty(s.GetProperty("seriesInstanceUid").GetString()));
            roles.Add(s.GetProperty("role").GetString()!);
        }
        // Src: shared/reference/mr/README.md — T2w, one multi-b DWI series, ADC, computed b=1000 image.
        Assert.Equal(["t2w", "dwi", "adc", "dwi"], roles);
        var dwi = study.GetProperty("series")[1];
        Assert.Equal([50.0, 400, 800], dwi.GetProperty("bValues").EnumerateArray().Select(x => x.GetDouble()));
    }

    [Fact]
    public void TableLeavesThePatientIdOut()
    {
        var (code, output, _) = Run("inspect", SharedReference.PathOf("mr", "ProstateX-0000"));
        Assert.Equal(0, code);
        Assert.Contains("t2_tse_tra", output);
        Assert.DoesNotContain("ProstateX-0000", output);
        Assert.Contains("Caution", output);
    }

    [Fact]
    public void RoleOverrideIsApplied()
    {
        var folder = SharedReference.PathOf("dicom", "series-oblique");
        var (_, first, _) = Run("inspect", folder, "--json");
        var uid = JsonDocument.Parse(first).RootElement.GetProperty("studies")[0].GetProperty("series")[0].GetProperty("seriesInstanceUid").GetString();
        var (code, output, _) = Run("inspect", folder, "--json", "--role", $"{uid}=adc");
        Assert.Equal(0, code);
        Assert.Equal("adc", JsonDocument.Parse(output).RootElement.GetProperty("studies")[0].GetProperty("series")[0].GetProperty("role").GetString());
        Assert.Equal(2, Run("inspect", folder, "--role", "nonsense").Code);
        Assert.Equal(3, Run("inspect", folder, "--role", "1.2.3.4=t2w").Code);
    }

    [Fact]
    public void SingleFileJsonGivesPixelStatistics()
    {
        // Src: shared/reference/dicom/series-oblique/manifest.csv (GDCM decode, dcmtk identical): IM0002.dcm
        // rows 64, columns 80, frame 1 min 100, max 1000, mean 158.359.
        var (code, output, _) = Run("inspect", SharedReference.PathOf("dicom", "series-oblique", "IM0002.dcm"), "--json");
        Assert.Equal(0, code);
        var root = JsonDocument.Parse(output).RootElement;
        Assert.Equal("1.2.840.10008.1.2.1", root.GetProperty("transferSyntaxUid").GetString());
        Assert.Equal(64, root.GetProperty("rows").GetInt32());
        Assert.Equal(80, root.GetProperty("columns").GetInt32());
        Assert.Equal(1, root.GetProperty("frames").GetInt32());
        var stats = Assert.Single(root.GetProperty("pixelStats").EnumerateArray());
        Assert.Equal(100, stats.GetProperty("min").GetInt64());
        Assert.Equal(1000, stats.GetProperty("max").GetInt64());
        Assert.Equal(158.359, stats.GetProperty("mean").GetDouble(), 1e-3);
        Assert.Equal("16f53d18689cd0cbc60f8e6a21413a530578351f5979d9e2f7e915c25cf4bdd3", stats.GetProperty("sha256").GetString());
    }

    [Fact]
    public void EmptyFolderIsOneClearErrorLine()
    {
        var (code, output, err) = Run("inspect", _tmp);
        Assert.Equal(3, code);
        Assert.Equal("", output);
        Assert.Contains("no files", err);
        Assert.Single(err.Trim().Split('\n'));
    }

    [Fact]
    public void NiftiFileIsInspected()
    {
        var g = new Geometry(new Size3(4, 5, 6), new Vec3(1, 2, 3), new Vec3(10, -20, 30), Mat3.Identity);
        var path = Path.Combine(_tmp, "t2.nii.gz");
        NiftiFile.Write(path, new Serimetry.Engine.Core.Volume<float>(g));
        var (code, output, err) = Run("inspect", path, "--json");
        Assert.True(code == 0, err);
        var s = JsonDocument.Parse(output).RootElement.GetProperty("studies")[0].GetProperty("series")[0];
        Assert.Equal([4, 5, 6], s.GetProperty("size").EnumerateArray().Select(x => x.GetInt32()));
        Assert.Equal([10.0, -20, 30], s.GetProperty("origin").EnumerateArray().Select(x => x.GetDouble()));
    }
}
