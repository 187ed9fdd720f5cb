using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Nifti;

/// <summary>
/// Our NIfTI files as the NIfTI reference C library sees them, and files made by that library read by us.
/// Src: nifti_tool 2.x (Debian nifti-bin), the NIfTI reference library's tool; field meanings from nifti1.h/nifti2.h.
/// </summary>
public sealed class NiftiToolConformanceTests : IDisposable
{
    private readonly ScratchFolder _scratch = new();

    public void Dispose() => _scratch.Dispose();

    private static readonly Mat3 RasFromLps = Mat3.Diagonal(new Vec3(-1, -1, 1));

    internal static Mat3 Rotation(double ax, double ay, double az)
    {
        var rx = new Mat3(1, 0, 0, 0, Math.Cos(ax), -Math.Sin(ax), 0, Math.Sin(ax), Math.Cos(ax));
        var ry = new Mat3(Math.Cos(ay), 0, Math.Sin(ay), 0, 1, 0, -Math.Sin(ay), 0, Math.Cos(ay));
        var rz = new Mat3(Math.Cos(az), -Math.Sin(az), 0, Math.Sin(az), Math.Cos(az), 0, 0, 0, 1);
        return rz * ry * rx;
    }

    private static Geometry Oblique(bool leftHanded)
    {
        var dir = Rotation(0.4, -0.25, 1.1);
        if (leftHanded) dir = dir * Mat3.Diagonal(new Vec3(1, 1, -1));
        return new Geometry(new Size3(9, 7, 5), new Vec3(0.55, 0.7, 3.0), new Vec3(-61.5, 23.25, 40.125), dir);
    }

    /// <summary>The RAS 4x4 (row-major) that a geometry should be written as: diag(−1,−1,1,1)·[D·diag(s) | o].</summary>
    private static double[] ExpectedRas(Geometry g)
    {
        var m = RasFromLps * g.Direction * Mat3.Diagonal(g.SpacingMm);
        var t = RasFromLps * g.OriginMm;
        return [m.M00, m.M01, m.M02, t.X, m.M10, m.M11, m.M12, t.Y, m.M20, m.M21, m.M22, t.Z, 0, 0, 0, 1];
    }

    private static void AssertClose(double[] expected, double[] actual, double tol, string what)
    {
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++)
            Assert.True(Math.Abs(expected[i] - actual[i]) <= tol * Math.Max(1, Math.Abs(expected[i])),
                $"{what}[{i}]: nifti_tool shows {actual[i]}, expected {expected[i]}");
    }

    [Theory]
    [InlineData("a.nii", 1, false)]
    [InlineData("b.nii.gz", 1, true)]
    [InlineData("c.nii", 2, true)]
    [InlineData("d.nii.gz", 2, false)]
    public void WrittenHeaderShowsIntendedGeometryInNiftiTool(string name, int version, bool leftHanded)
    {
        var g = Oblique(leftHanded);
        var path = _scratch.PathOf(name);
        NiftiFile.Write(path, new Volume<float>(g), new NiftiWriteOptions(Version: version));
        var hdr = NiftiTool.Header(path);
        Assert.Equal(version == 1 ? 348 : 540, NiftiTool.Number(hdr, "sizeof_hdr"));
        Assert.Equal(version == 1 ? "n+1" : "n+2", hdr["magic"][0]);
        Assert.Equal(new double[] { 3, 9, 7, 5, 1, 1, 1, 1 }, NiftiTool.Numbers(hdr, "dim"));
        Assert.Equal(16, NiftiTool.Number(hdr, "datatype"));
        Assert.Equal(1, NiftiTool.Number(hdr, "qform_code"));
        Assert.Equal(1, NiftiTool.Number(hdr, "sform_code"));
        Assert.Equal(2, NiftiTool.Number(hdr, "xyzt_units")); // NIFTI_UNITS_MM
        var pixdim = NiftiTool.Numbers(hdr, "pixdim");
        Assert.Equal(leftHanded ? -1 : 1, pixdim[0]); // qfac
        AssertClose([0.55, 0.7, 3.0], pixdim[1..4], 1e-6, "pixdim");
        var ras = ExpectedRas(g);
        AssertClose(ras[0..4], NiftiTool.Numbers(hdr, "srow_x"), 2e-6, "srow_x");
        AssertClose(ras[4..8], NiftiTool.Numbers(hdr, "srow_y"), 2e-6, "srow_y");
        AssertClose(ras[8..12], NiftiTool.Numbers(hdr, "srow_z"), 2e-6, "srow_z");

        // The library's own matrices: qto_xyz from our quaternion + qfac + pixdim, sto_xyz from the srows.
        var nim = NiftiTool.Image(path);
        AssertClose(ras, NiftiTool.Numbers(nim, "qto_xyz"), 2e-5, "qto_xyz");
        AssertClose(ras, NiftiTool.Numbers(nim, "sto_xyz"), 2e-5, "sto_xyz");
        Assert.Equal(2, NiftiTool.Number(nim, "xyz_units"));
    }

    // Src: nifti_tool -disp_ci prints the stored voxel values of a row as the reference library reads them.
    [Fact]
    public void WrittenVoxelsAreTheOnesNiftiToolReads()
    {
        var g = Oblique(true);
        var v = new Volume<short>(g);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = (short)((i * 7919) % 60000 - 30000);
        var path = _scratch.PathOf("rows.nii.gz");
        NiftiFile.Write(path, v);
        foreach (var (j, k) in new[] { (0, 0), (3, 2), (6, 4) })
        {
            var outText = NiftiTool.Run("-disp_ci", "-1", j.ToString(CultureInfo.InvariantCulture), k.ToString(CultureInfo.InvariantCulture),
                "0", "0", "0", "0", "-infiles", path);
            var line = outText.Split('\n', StringSplitOptions.RemoveEmptyEntries).Last();
            var values = line.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(s => double.Parse(s, CultureInfo.InvariantCulture)).ToArray();
            Assert.Equal(9, values.Length);
            for (int i = 0; i < 9; i++) Assert.Equal(v[i, j, k], values[i]);
        }
    }

    [Theory]
    [InlineData(2, NiftiDataType.UInt8)]
    [InlineData(4, NiftiDataType.Int16)]
    [InlineData(8, NiftiDataType.Int32)]
    [InlineData(16, NiftiDataType.Float32)]
    [InlineData(64, NiftiDataType.Float64)]
    [InlineData(256, NiftiDataType.Int8)]
    [InlineData(512, NiftiDataType.UInt16)]
    [InlineData(768, NiftiDataType.UInt32)]
    [InlineData(1024, NiftiDataType.Int64)]
    [InlineData(1280, NiftiDataType.UInt64)]
    public void ReadsImagesMadeByNiftiTool(int code, NiftiDataType expected)
    {
        var made = _scratch.PathOf($"made{code}.nii");
        NiftiTool.Run("-make_im", "-prefix", made, "-new_dims", "3", "4", "5", "6", "0", "0", "0", "0", "-new_datatype", code.ToString(CultureInfo.InvariantCulture));
        var image = NiftiFile.Read(made);
        Assert.Equal(expected, image.Header.DataType);
        Assert.Equal(new Size3(4, 5, 6), image.Geometry.Size);
        Assert.Equal("pixdim", image.GeometrySource);
        Assert.Contains(image.Warnings, w => w.Contains("orientation unknown"));
        Assert.All(image.Volume.Voxels, x => Assert.Equal(0f, x));

        // Scaling set by the reference tool: every stored 0 reads as scl_slope·0 + scl_inter = 5.
        var scaled = _scratch.PathOf($"scaled{code}.nii");
        NiftiTool.Run("-mod_hdr", "-prefix", scaled, "-infiles", made, "-mod_field", "scl_slope", "2", "-mod_field", "scl_inter", "5");
        Assert.All(NiftiFile.Read(scaled).Volume.Voxels, x => Assert.Equal(5f, x));
    }

    // The reference library turns quaternion + qfac + pixdim into qto_xyz; our LPS geometry must place every
    // corner voxel where diag(−1,−1,1)·qto_xyz does.
    [Theory]
    [InlineData(0.1, -0.2, 0.3, -1)]
    [InlineData(0.0, 0.0, 1.0, 1)]
    [InlineData(0.7, 0.1, -0.7, 1)]
    [InlineData(-0.35, 0.6, 0.2, -1)]
    public void QformDecodingMatchesTheReferenceLibrary(double b, double c, double d, int qfac)
    {
        var made = _scratch.PathOf("q0.nii");
        var path = _scratch.PathOf("q.nii");
        NiftiTool.Run("-make_im", "-prefix", made, "-new_dims", "3", "6", "5", "4", "0", "0", "0", "0", "-new_datatype", "4");
        NiftiTool.Run("-mod_hdr", "-prefix", path, "-infiles", made,
            "-mod_field", "qform_code", "1",
            "-mod_field", "quatern_b", F(b), "-mod_field", "quatern_c", F(c), "-mod_field", "quatern_d", F(d),
            "-mod_field", "qoffset_x", "12.5", "-mod_field", "qoffset_y", "-30.25", "-mod_field", "qoffset_z", "7.75",
            "-mod_field", "pixdim", $"{qfac} 0.7 0.8 2.5 0 0 0 0");
        var qto = NiftiTool.Numbers(NiftiTool.Image(path), "qto_xyz");
        var image = NiftiFile.Read(path);
        Assert.Equal("qform", image.GeometrySource);
        AssertCornersMatch(image.Geometry, qto);
    }

    // Src: nifti_tool -disp_nim: the reference library takes a zero or negative pixdim as 1 when it builds qto_xyz.
    [Fact]
    public void NonPositivePixdimIsTakenAsOneLikeTheReferenceLibrary()
    {
        var made = _scratch.PathOf("p0.nii");
        var path = _scratch.PathOf("p.nii");
        NiftiTool.Run("-make_im", "-prefix", made, "-new_dims", "3", "6", "5", "4", "0", "0", "0", "0", "-new_datatype", "4");
        NiftiTool.Run("-mod_hdr", "-prefix", path, "-infiles", made, "-mod_field", "qform_code", "1",
            "-mod_field", "pixdim", "1 0 -2 0.5 0 0 0 0");
        var qto = NiftiTool.Numbers(NiftiTool.Image(path), "qto_xyz");
        var image = NiftiFile.Read(path);
        AssertCornersMatch(image.Geometry, qto);
        Assert.Equal(2, image.Warnings.Count(w => w.Contains("1 mm is assumed")));
    }

    // nifti1.h: when sform_code > 0 the sform is used even if a qform is present; a disagreement is recorded.
    [Fact]
    public void SformTakesPrecedenceOverQform()
    {
        var made = _scratch.PathOf("s0.nii");
        var path = _scratch.PathOf("s.nii");
        NiftiTool.Run("-make_im", "-prefix", made, "-new_dims", "3", "6", "5", "4", "0", "0", "0", "0", "-new_datatype", "4");
        NiftiTool.Run("-mod_hdr", "-prefix", path, "-infiles", made,
            "-mod_field", "qform_code", "1", "-mod_field", "quatern_d", "0.5",
            "-mod_field", "sform_code", "2",
            "-mod_field", "srow_x", "0 -0.9 0 20", "-mod_field", "srow_y", "1.1 0 0 -5", "-mod_field", "srow_z", "0 0 3 1");
        var sto = NiftiTool.Numbers(NiftiTool.Image(path), "sto_xyz");
        var image = NiftiFile.Read(path);
        Assert.Equal("sform", image.GeometrySource);
        AssertCornersMatch(image.Geometry, sto);
        Assert.Contains(image.Warnings, w => w.Contains("qform and sform disagree"));
    }

    // Documented choice (docs/nifti.md): a sheared sform is replaced by the nearest rotation, with a warning.
    [Fact]
    public void ShearedSformIsOrthogonalisedWithAWarning()
    {
        var made = _scratch.PathOf("h0.nii");
        var path = _scratch.PathOf("h.nii");
        NiftiTool.Run("-make_im", "-prefix", made, "-new_dims", "3", "6", "5", "4", "0", "0", "0", "0", "-new_datatype", "4");
        NiftiTool.Run("-mod_hdr", "-prefix", path, "-infiles", made, "-mod_field", "sform_code", "1",
            "-mod_field", "srow_x", "1 0.1 0 0", "-mod_field", "srow_y", "0 1 0 0", "-mod_field", "srow_z", "0 0 2 0");
        var image = NiftiFile.Read(path);
        Assert.Contains(image.Warnings, w => w.Contains("not orthogonal"));
        Assert.True(image.Geometry.Direction.IsOrthonormal(1e-9));
        Assert.Equal(Math.Sqrt(1.01), image.Geometry.SpacingMm.Y, 6);
    }

    // Src: nifti_tool -swap_as_nifti byte-swaps the header fields (byteorder 2 = MSB first); the test swaps the
    // int16 voxel words, and nifti_tool -disp_ci then shows the original values, as our reader must.
    [Fact]
    public void BigEndianFileReadsTheSameAsNiftiToolReadsIt()
    {
        var g = Oblique(true);
        var v = new Volume<short>(g);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = (short)(i * 37 - 1000);
        var path = _scratch.PathOf("be.nii");
        NiftiFile.Write(path, v);
        NiftiTool.Run("-swap_as_nifti", "-overwrite", "-infiles", path);
        var bytes = File.ReadAllBytes(path);
        for (int o = 352; o + 1 < bytes.Length; o += 2) (bytes[o], bytes[o + 1]) = (bytes[o + 1], bytes[o]);
        File.WriteAllBytes(path, bytes);
        Assert.Equal(2, NiftiTool.Number(NiftiTool.Image(path), "byteorder"));
        var row = NiftiTool.Run("-disp_ci", "-1", "2", "3", "0", "0", "0", "0", "-infiles", path)
            .Split('\n', StringSplitOptions.RemoveEmptyEntries).Last()
            .Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
        var image = NiftiFile.Read(path);
        Assert.True(image.Header.BigEndian);
        for (int i = 0; i < 9; i++)
        {
            Assert.Equal(v[i, 2, 3], row[i]);
            Assert.Equal(row[i], image.Volume[i, 2, 3]);
        }
        for (int i = 0; i < v.Voxels.Length; i++) Assert.Equal(v.Voxels[i], image.Volume.Voxels[i]);
        Assert.True((image.Geometry.OriginMm - g.OriginMm).Norm < 1e-4);
        Assert.True(image.Geometry.Direction.MaxAbsDifference(g.Direction) < 1e-5);
        Assert.True((image.Geometry.SpacingMm - g.SpacingMm).Norm < 1e-5);
    }

    private static string F(double x) => x.ToString("R", CultureInfo.InvariantCulture);

    private static void AssertCornersMatch(Geometry g, double[] rasRowMajor4x4)
    {
        for (int corner = 0; corner < 8; corner++)
        {
            var idx = new Vec3((corner & 1) * (g.Size.X - 1), ((corner >> 1) & 1) * (g.Size.Y - 1), ((corner >> 2) & 1) * (g.Size.Z - 1));
            var m = rasRowMajor4x4;
            var ras = new Vec3(
                m[0] * idx.X + m[1] * idx.Y + m[2] * idx.Z + m[3],
                m[4] * idx.X + m[5] * idx.Y + m[6] * idx.Z + m[7],
                m[8] * idx.X + m[9] * idx.Y + m[10] * idx.Z + m[11]);
            var lpsExpected = RasFromLps * ras;
            var ours = g.IndexToPhysical(idx);
            Assert.True((ours - lpsExpected).Norm < 1e-4, $"corner {idx}: ours {ours}, reference {lpsExpected}");
        }
    }
}
