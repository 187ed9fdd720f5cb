using System.Buffers.Binary;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Imaging;
using Xunit;

namespace Serimetry.Tests.Io.Nifti;

public sealed class NiftiRoundTripTests : IDisposable
{
    private readonly NiftiTestFiles _files = new();

    public void Dispose() => _files.Dispose();

    private static readonly Size3 Grid = new(11, 9, 5);

    // Src: common practice (write-then-read identity); field layout from nifti1.h / nifti2.h.
    [Theory]
    [InlineData("f.nii", 1, false)]
    [InlineData("f.nii.gz", 1, true)]
    [InlineData("f2.nii", 2, false)]
    [InlineData("f2.nii.gz", 2, true)]
    public void FloatRoundTripPreservesVoxelsAndGeometry(string name, int version, bool leftHanded)
    {
        var g = TestGrids.Oblique(Grid, leftHanded);
        var v = TestGrids.Random(g, 11);
        var path = _files.PathOf(name);
        NiftiFile.Write(path, v, new NiftiWriteOptions(Version: version));
        var back = NiftiFile.Read(path);
        Assert.Equal(version, back.Header.Version);
        Assert.Equal(NiftiDataType.Float32, back.Header.DataType);
        Assert.Equal("sform", back.GeometrySource);
        Assert.Equal(v.Voxels, back.Volume.Voxels);
        NiftiTestFiles.AssertGeometryClose(g, back.Geometry);
        Assert.Empty(back.Warnings);
    }

    [Fact]
    public void Int16AndUInt8RoundTrip()
    {
        var g = TestGrids.Oblique(Grid, leftHanded: true);
        var s = new Volume<short>(g);
        var b = new Volume<byte>(g);
        for (int i = 0; i < s.Voxels.Length; i++)
        {
            s.Voxels[i] = (short)(i * 611 - 30000);
            b.Voxels[i] = (byte)(i * 7);
        }
        NiftiFile.Write(_files.PathOf("s.nii.gz"), s);
        NiftiFile.Write(_files.PathOf("b.nii"), b);
        var sBack = NiftiFile.Read(_files.PathOf("s.nii.gz"));
        var bBack = NiftiFile.Read(_files.PathOf("b.nii"));
        Assert.Equal(NiftiDataType.Int16, sBack.Header.DataType);
        Assert.Equal(NiftiDataType.UInt8, bBack.Header.DataType);
        for (int i = 0; i < s.Voxels.Length; i++)
        {
            Assert.Equal(s.Voxels[i], sBack.Volume.Voxels[i]);
            Assert.Equal(b.Voxels[i], bBack.Volume.Voxels[i]);
        }
        NiftiTestFiles.AssertGeometryClose(g, sBack.Geometry);
        NiftiTestFiles.AssertGeometryClose(g, bBack.Geometry);
        Assert.Equal(b.Voxels, NiftiFile.ReadMask(_files.PathOf("b.nii")).Voxels);
    }

    // Src: nifti1.h: with sform_code 0 the qform (quaternion, qfac = pixdim[0]) places the grid; with
    // qform_code 0 the sform does. Both written mappings must describe the same LPS geometry.
    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void QformAloneAndSformAloneGiveTheSameGeometry(bool leftHanded)
    {
        var g = TestGrids.Oblique(Grid, leftHanded);
        var path = _files.PathOf("q.nii");
        NiftiFile.Write(path, TestGrids.Random(g, 12));
        NiftiTestFiles.PatchInt16(path, 254, 0); // sform_code
        var viaQform = NiftiFile.Read(path);
        Assert.Equal("qform", viaQform.GeometrySource);
        NiftiTestFiles.AssertGeometryClose(g, viaQform.Geometry);
        NiftiTestFiles.PatchInt16(path, 254, 1);
        NiftiTestFiles.PatchInt16(path, 252, 0); // qform_code
        var viaSform = NiftiFile.Read(path);
        Assert.Equal("sform", viaSform.GeometrySource);
        NiftiTestFiles.AssertGeometryClose(g, viaSform.Geometry);
    }

    // Src: facts.md §10 (A_LPS = diag(−1,−1,1)·A_RAS): an RAS-identity sform is an LPS grid with x and y reversed.
    [Fact]
    public void RasIdentityIsLpsWithXAndYReversed()
    {
        var g = Geometry.Axial(new Size3(4, 3, 2), new Vec3(1, 1, 1), Vec3.Zero);
        var path = _files.PathOf("ras.nii");
        NiftiFile.Write(path, new Volume<float>(g));
        // Overwrite the sform with the RAS identity plus offset (10, 20, 30) and drop the qform.
        var bytes = File.ReadAllBytes(path);
        float[] srow = [1, 0, 0, 10, 0, 1, 0, 20, 0, 0, 1, 30];
        for (int i = 0; i < 12; i++) BinaryPrimitives.WriteSingleLittleEndian(bytes.AsSpan(280 + 4 * i), srow[i]);
        BinaryPrimitives.WriteInt16LittleEndian(bytes.AsSpan(252), 0);
        File.WriteAllBytes(path, bytes);
        var geo = NiftiFile.ReadVolume(path).Geometry;
        Assert.Equal(new Vec3(-10, -20, 30), geo.OriginMm);
        Assert.Equal(new Vec3(-1, 0, 0), geo.Direction.Column(0));
        Assert.Equal(new Vec3(0, -1, 0), geo.Direction.Column(1));
        Assert.Equal(new Vec3(0, 0, 1), geo.Direction.Column(2));
    }

    // Src: nifti1.h scl_slope/scl_inter comment: value = scl_slope * stored + scl_inter; slope 0 = no scaling.
    [Fact]
    public void SlopeAndInterceptAreApplied()
    {
        var g = Geometry.Axial(new Size3(3, 2, 2), new Vec3(1, 1, 1), Vec3.Zero);
        var s = new Volume<short>(g);
        for (int i = 0; i < s.Voxels.Length; i++) s.Voxels[i] = (short)(i - 4);
        var path = _files.PathOf("scaled.nii");
        NiftiFile.Write(path, s);
        NiftiTestFiles.PatchFloat(path, 112, 2.5f);
        NiftiTestFiles.PatchFloat(path, 116, -3f);
        var scaled = NiftiFile.Read(path).Volume.Voxels;
        for (int i = 0; i < s.Voxels.Length; i++) Assert.Equal(2.5f * (i - 4) - 3f, scaled[i]);
        NiftiTestFiles.PatchFloat(path, 112, 0f);
        var unscaled = NiftiFile.Read(path).Volume.Voxels;
        for (int i = 0; i < s.Voxels.Length; i++) Assert.Equal(i - 4, unscaled[i]);
    }

    [Fact]
    public void FourDimensionalStackReadsAllOrOneVolume()
    {
        var g = TestGrids.Oblique(Grid);
        var vols = new[] { TestGrids.Random(g, 1), TestGrids.Random(g, 2), TestGrids.Random(g, 3) };
        var path = _files.PathOf("dwi.nii.gz");
        NiftiFile.Write(path, vols);
        var all = NiftiFile.Read(path);
        Assert.Equal(3, all.VolumeCount);
        Assert.Equal(4, all.Header.Rank);
        for (int v = 0; v < 3; v++) Assert.Equal(vols[v].Voxels, all.Volumes[v].Voxels);
        var second = NiftiFile.ReadVolume(path, 2);
        Assert.Equal(2, second.FirstVolumeIndex);
        Assert.Equal(vols[2].Voxels, second.Volume.Voxels);
        var ex = Assert.Throws<InvalidParameterException>(() => NiftiFile.ReadVolume(path, 3));
        Assert.Contains("holds 3 volume", ex.Message);
    }

    // Src: common practice (two's-complement and IEEE 754 little-endian layouts, as nifti1.h datatypes declare).
    [Fact]
    public void EveryScalarDatatypeDecodes()
    {
        var g = Geometry.Axial(new Size3(2, 2, 1), new Vec3(1, 1, 1), Vec3.Zero);
        double[] expect8 = [-128, -1, 0, 127];
        CheckType(g, NiftiDataType.Int8, [0x80, 0xFF, 0x00, 0x7F], expect8);
        CheckType(g, NiftiDataType.UInt8, [0, 1, 200, 255], [0, 1, 200, 255]);
        CheckType(g, NiftiDataType.UInt16, Le<ushort>([0, 1, 40000, 65535], 2, (s, x) => BinaryPrimitives.WriteUInt16LittleEndian(s, x)), [0, 1, 40000, 65535]);
        CheckType(g, NiftiDataType.Int16, Le<short>([-32768, -1, 5, 32767], 2, (s, x) => BinaryPrimitives.WriteInt16LittleEndian(s, x)), [-32768, -1, 5, 32767]);
        CheckType(g, NiftiDataType.Int32, Le<int>([-2000000, -1, 7, 16777216], 4, (s, x) => BinaryPrimitives.WriteInt32LittleEndian(s, x)), [-2000000, -1, 7, 16777216]);
        CheckType(g, NiftiDataType.UInt32, Le<uint>([0, 1, 3000000000, 8], 4, (s, x) => BinaryPrimitives.WriteUInt32LittleEndian(s, x)), [0, 1, 3000000000, 8]);
        CheckType(g, NiftiDataType.Int64, Le<long>([-(1L << 40), -1, 9, 1L << 33], 8, (s, x) => BinaryPrimitives.WriteInt64LittleEndian(s, x)), [-(1L << 40), -1, 9, 1L << 33]);
        CheckType(g, NiftiDataType.UInt64, Le<ulong>([0, 1, 1UL << 40, 12], 8, (s, x) => BinaryPrimitives.WriteUInt64LittleEndian(s, x)), [0, 1, 1UL << 40, 12]);
        CheckType(g, NiftiDataType.Float32, Le<float>([-1.5f, 0, 3.25f, 1e-3f], 4, (s, x) => BinaryPrimitives.WriteSingleLittleEndian(s, x)), [-1.5, 0, 3.25, 1e-3f]);
        CheckType(g, NiftiDataType.Float64, Le<double>([-1.5, 0, 3.25, 1e30], 8, (s, x) => BinaryPrimitives.WriteDoubleLittleEndian(s, x)), [-1.5, 0, 3.25, 1e30]);
    }

    private delegate void Put<T>(Span<byte> s, T value);

    private static byte[] Le<T>(T[] values, int width, Put<T> put)
    {
        var b = new byte[values.Length * width];
        for (int i = 0; i < values.Length; i++) put(b.AsSpan(i * width), values[i]);
        return b;
    }

    private void CheckType(Geometry g, NiftiDataType type, byte[] bytes, double[] expected)
    {
        var path = _files.Craft($"{type}.nii", g, type, bytes);
        var read = NiftiFile.Read(path);
        Assert.Equal(type, read.Header.DataType);
        for (int i = 0; i < expected.Length; i++) Assert.Equal((float)expected[i], read.Volume.Voxels[i]);
    }

    [Fact]
    public void MaskReaderKeepsIntegerLabelsAndRefusesOthers()
    {
        var g = Geometry.Axial(new Size3(3, 3, 1), new Vec3(1, 1, 1), Vec3.Zero);
        var v = new Volume<float>(g);
        v.Voxels[1] = 1; v.Voxels[4] = 2; v.Voxels[8] = 255;
        NiftiFile.Write(_files.PathOf("labels.nii"), v);
        var mask = NiftiFile.ReadMask(_files.PathOf("labels.nii"));
        Assert.Equal(new byte[] { 0, 1, 0, 0, 2, 0, 0, 0, 255 }, mask.Voxels);
        v.Voxels[5] = 0.5f;
        NiftiFile.Write(_files.PathOf("frac.nii"), v);
        var ex = Assert.Throws<InputFormatException>(() => NiftiFile.ReadMask(_files.PathOf("frac.nii")));
        Assert.Contains("(2, 1, 0) holds 0.5", ex.Message);
        v.Voxels[5] = 256;
        NiftiFile.Write(_files.PathOf("big.nii"), v);
        Assert.Throws<InputFormatException>(() => NiftiFile.ReadMask(_files.PathOf("big.nii")));
    }

    [Fact]
    public void WritingReplacesAnExistingFileAtomically()
    {
        var g = Geometry.Axial(new Size3(2, 2, 2), new Vec3(1, 1, 1), Vec3.Zero);
        var path = _files.PathOf("w.nii");
        NiftiFile.Write(path, new Volume<float>(g));
        var v = new Volume<float>(g);
        v.Voxels[3] = 9;
        NiftiFile.Write(path, v, new NiftiWriteOptions(NiftiXformCode.Aligned));
        var back = NiftiFile.Read(path);
        Assert.Equal(9, back.Volume.Voxels[3]);
        Assert.Equal(2, back.Header.QformCode);
        Assert.Equal(2, back.Header.SformCode);
        Assert.False(File.Exists(path + ".partial"));
    }
}
