using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Nifti;

/// <summary>
/// The IBSI-1 digital phantom (Src: IBSI, theibsi/data_sets ibsi_1_digital_phantom, CC BY 4.0; voxel listing
/// shared/reference/ibsi/digital_phantom/phantom_voxels.csv, see its README) read through our NIfTI reader.
/// </summary>
public class IbsiPhantomNiftiTests
{
    private static string Phantom(params string[] parts) => SharedReference.PathOf(["ibsi", "digital_phantom", .. parts]);

    private static List<(int I, int J, int K, int Grey, int InRoi)> Voxels()
    {
        var rows = new List<(int, int, int, int, int)>();
        foreach (var line in File.ReadLines(Phantom("phantom_voxels.csv")).Skip(1))
        {
            if (string.IsNullOrWhiteSpace(line)) continue;
            var f = line.Split(',').Select(s => int.Parse(s, CultureInfo.InvariantCulture)).ToArray();
            rows.Add((f[0], f[1], f[2], f[3], f[4]));
        }
        return rows;
    }

    [Fact]
    public void ImageVoxelsMatchThePublishedListing()
    {
        var image = NiftiFile.Read(Phantom("nifti", "image", "phantom.nii.gz"));
        Assert.Equal(new Size3(5, 4, 4), image.Geometry.Size);
        Assert.Equal(NiftiDataType.Int16, image.Header.DataType);
        var rows = Voxels();
        Assert.Equal(80, rows.Count);
        foreach (var (i, j, k, grey, _) in rows) Assert.Equal(grey, image.Volume[i, j, k]);
    }

    [Fact]
    public void MaskMatchesThePublishedListing()
    {
        var mask = NiftiFile.ReadMask(Phantom("nifti", "mask", "mask.nii.gz"));
        Assert.Equal(new Size3(5, 4, 4), mask.Size);
        int inside = 0;
        foreach (var (i, j, k, _, inRoi) in Voxels())
        {
            Assert.Equal(inRoi, mask[i, j, k]);
            inside += inRoi;
        }
        Assert.Equal(74, inside); // ibsi/README.md: 74 of 80 voxels in the ROI
    }

    // Src: nifti_tool -disp_hdr on the phantom (sform_code 1 wins over qform_code 2; srow = diag(−2,−2,2), offset 0).
    [Fact]
    public void GeometryIsTheSformConvertedToLps()
    {
        var path = Phantom("nifti", "image", "phantom.nii.gz");
        var hdr = NiftiTool.Header(path);
        var image = NiftiFile.Read(path);
        Assert.Equal("sform", image.GeometrySource);
        var sx = NiftiTool.Numbers(hdr, "srow_x");
        var sy = NiftiTool.Numbers(hdr, "srow_y");
        var sz = NiftiTool.Numbers(hdr, "srow_z");
        var g = image.Geometry;
        for (int corner = 0; corner < 8; corner++)
        {
            var c = new Vec3((corner & 1) * 4, ((corner >> 1) & 1) * 3, ((corner >> 2) & 1) * 3);
            var ras = new Vec3(
                sx[0] * c.X + sx[1] * c.Y + sx[2] * c.Z + sx[3],
                sy[0] * c.X + sy[1] * c.Y + sy[2] * c.Z + sy[3],
                sz[0] * c.X + sz[1] * c.Y + sz[2] * c.Z + sz[3]);
            var lps = new Vec3(-ras.X, -ras.Y, ras.Z);
            Assert.True((g.IndexToPhysical(c) - lps).Norm < 1e-9, $"corner {c}: {g.IndexToPhysical(c)} vs {lps}");
        }
        Assert.Equal(new Vec3(2, 2, 2), g.SpacingMm);
    }
}
