using System.Diagnostics;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Series;

/// <summary>
/// The synthetic oblique series (shared/reference/dicom/series-oblique): geometry and voxel values.
/// Src: shared/reference/dicom/README.md section "Synthetic oblique series" (written by dcmtk's dump2dcm,
/// decoded identically by dcmtk and GDCM; GDCM's gdcminfo origin/direction in headers.csv).
/// </summary>
public sealed class ObliqueSeriesTests : IDisposable
{
    private static readonly string Folder = SharedReference.PathOf("dicom", "series-oblique");
    private readonly string _tmp = Directory.CreateTempSubdirectory("serimetry-oblique-").FullName;

    public void Dispose() => Directory.Delete(_tmp, true);

    private static AssembledSeries Only(string folder)
    {
        var study = Assert.Single(StudyIndex.Build(folder, DicomSliceHeaderReader.Default).Assemble());
        return Assert.Single(study.Series);
    }

    [Fact]
    public void GeometryMatchesTheDocumentedOne()
    {
        var s = Only(Folder);
        var g = s.MainStacks[0].Geometry!;
        Assert.Equal(new Size3(80, 64, 10), g.Size);
        Assert.True((g.SpacingMm - new Vec3(0.8, 0.9, 2.5)).Norm < 1e-4, g.Describe());
        Assert.True((g.OriginMm - new Vec3(-32, -30, 12.5)).Norm < 1e-4, g.Describe());
        var expected = new Mat3(1, 0, 0, 0, 0.96592582628907, -0.25881904510252, 0, 0.25881904510252, 0.96592582628907);
        Assert.True(g.Direction.MaxAbsDifference(expected) < 1e-4, g.Describe());
        // Instance order runs against the normal: the first slice along n is IM0010.
        Assert.EndsWith("IM0010.dcm", s.MainStacks[0].Slices[0].Source.Container);
        Assert.Empty(s.Summary.Warnings);
    }

    [Fact]
    public void VoxelValuesMatchTheDocumentedCounts()
    {
        var v = StackVolumeBuilder.Build(Only(Folder));
        int n100 = 0, n1000 = 0, n2000 = 0, other = 0;
        var sum = Vec3.Zero;
        for (int k = 0; k < v.Size.Z; k++)
            for (int j = 0; j < v.Size.Y; j++)
                for (int i = 0; i < v.Size.X; i++)
                {
                    switch (v[i, j, k])
                    {
                        case 100: n100++; break;
                        case 1000: n1000++; break;
                        case 2000: n2000++; sum += v.Geometry.IndexToPhysical(i, j, k); break;
                        default: other++; break;
                    }
                }
        Assert.Equal((44639, 6501, 60, 0), (n100, n1000, n2000, other));
        // The marker sphere (radius 3 mm) is centred at M = (9.6, 0.472283, 35.704185): its voxels' centroid
        // lands near M only if rows, columns and slices are placed the right way round.
        Assert.True((sum / n2000 - new Vec3(9.6, 0.472283, 35.704185)).Norm < 1.0, $"{sum / n2000}");
    }

    private void CopyAll(params string[] except)
    {
        foreach (var f in Directory.GetFiles(Folder, "*.dcm"))
            if (!except.Contains(Path.GetFileName(f))) File.Copy(f, Path.Combine(_tmp, Path.GetFileName(f)));
    }

    [Fact]
    public void MissingSliceIsAGapAndRefusedForVolumes()
    {
        CopyAll("IM0005.dcm");
        var s = Only(_tmp);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("gap") && w.Contains("1 slice(s) missing"));
        var e = Assert.Throws<GeometryMismatchException>(() => StackVolumeBuilder.Build(s));
        Assert.Contains("gap", e.Message);
    }

    [Fact]
    public void DuplicatePositionIsReported()
    {
        CopyAll();
        var copy = Path.Combine(_tmp, "IM0011.dcm");
        File.Copy(Path.Combine(Folder, "IM0003.dcm"), copy);
        Modify(copy, "(0008,0018)=2.25.1234567", "(0020,0013)=11");
        var s = Only(_tmp);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("duplicate"));
    }

    [Fact]
    public void MixedOrientationsAreReported()
    {
        CopyAll();
        foreach (var f in new[] { "IM0001.dcm", "IM0002.dcm" })
            Modify(Path.Combine(_tmp, f), @"(0020,0037)=0\1\0\0\0\-1");
        var s = Only(_tmp);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("mixed orientations"));
        Assert.Equal(2, s.Stacks.Count);
        Assert.Equal(8, s.Summary.Size.Z);
    }

    [Fact]
    public void ZippedSeriesGivesTheSameGeometryAndVoxels()
    {
        var zip = Path.Combine(_tmp, "series.zip");
        System.IO.Compression.ZipFile.CreateFromDirectory(Folder, zip);
        var fromZip = Only(zip);
        var fromFolder = Only(Folder);
        Assert.True(fromZip.MainStacks[0].Geometry!.IsCongruentWith(fromFolder.MainStacks[0].Geometry!, 1e-9));
        Assert.Equal(StackVolumeBuilder.Build(fromFolder).Voxels, StackVolumeBuilder.Build(fromZip).Voxels);
    }

    /// <summary>Edits a copy with dcmtk's dcmodify (an outside tool; installed by the test script).</summary>
    private static void Modify(string file, params string[] assignments)
    {
        var psi = new ProcessStartInfo("dcmodify") { RedirectStandardError = true, RedirectStandardOutput = true };
        psi.ArgumentList.Add("-nb");
        foreach (var a in assignments)
        {
            psi.ArgumentList.Add("-m");
            psi.ArgumentList.Add(a);
        }
        psi.ArgumentList.Add(file);
        using var p = Process.Start(psi)!;
        p.WaitForExit();
        Assert.True(p.ExitCode == 0, p.StandardError.ReadToEnd());
    }
}
