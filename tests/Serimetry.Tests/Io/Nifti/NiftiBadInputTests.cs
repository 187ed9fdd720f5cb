using System.Buffers.Binary;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Imaging;
using Xunit;

namespace Serimetry.Tests.Io.Nifti;

/// <summary>Bad input gives a specific InputException, never a crash, hang or huge allocation (RULES.md "Bad input").</summary>
public sealed class NiftiBadInputTests : IDisposable
{
    private readonly NiftiTestFiles _files = new();

    public void Dispose() => _files.Dispose();

    private byte[] ValidFile(bool gz = false)
    {
        var g = TestGrids.Oblique(new Size3(6, 5, 4));
        var path = _files.PathOf(gz ? "valid.nii.gz" : "valid.nii");
        NiftiFile.Write(path, TestGrids.Random(g, 7));
        return File.ReadAllBytes(path);
    }

    private string Save(string name, byte[] bytes)
    {
        var path = _files.PathOf(name);
        File.WriteAllBytes(path, bytes);
        return path;
    }

    [Theory]
    [InlineData(0)]
    [InlineData(3)]
    [InlineData(200)]
    [InlineData(351)]
    [InlineData(500)]
    public void TruncatedNiiIsRefused(int keep)
    {
        var path = Save("cut.nii", ValidFile()[..keep]);
        var ex = Assert.ThrowsAny<InputException>(() => NiftiFile.Read(path));
        Assert.True(ex is InputFormatException, ex.GetType().Name);
        if (keep >= 352) Assert.Contains("truncated", ex.Describe());
    }

    [Fact]
    public void TruncatedNiiGzIsRefused()
    {
        var bytes = ValidFile(gz: true);
        foreach (int keep in new[] { 10, bytes.Length / 2, bytes.Length - 9 })
        {
            var path = Save($"cut{keep}.nii.gz", bytes[..keep]);
            var ex = Assert.ThrowsAny<InputException>(() => NiftiFile.Read(path));
            Assert.IsType<InputFormatException>(ex);
        }
    }

    [Fact]
    public void WrongSizeofHdrIsRefused()
    {
        var b = ValidFile();
        BinaryPrimitives.WriteInt32LittleEndian(b, 349);
        var ex = Assert.Throws<InputFormatException>(() => NiftiFile.Read(Save("size.nii", b)));
        Assert.Contains("sizeof_hdr", ex.Message);
    }

    // Dimensions whose product is far beyond Limits.MaxVoxels must be refused before any allocation.
    [Fact]
    public void AbsurdDimensionsAreRefusedBeforeAllocating()
    {
        var b = ValidFile();
        for (int a = 1; a <= 3; a++) BinaryPrimitives.WriteInt16LittleEndian(b.AsSpan(40 + 2 * a), 30000);
        var ex = Assert.Throws<InputLimitException>(() => NiftiFile.Read(Save("huge.nii", b)));
        Assert.Contains("exceeds the limit", ex.Message);

        var neg = ValidFile();
        BinaryPrimitives.WriteInt16LittleEndian(neg.AsSpan(44), -5);
        Assert.Throws<InputFormatException>(() => NiftiFile.Read(Save("neg.nii", neg)));

        var many = ValidFile();
        BinaryPrimitives.WriteInt16LittleEndian(many.AsSpan(40), 7);
        for (int a = 4; a <= 7; a++) BinaryPrimitives.WriteInt16LittleEndian(many.AsSpan(40 + 2 * a), 32000);
        Assert.Throws<InputLimitException>(() => NiftiFile.Read(Save("many.nii", many)));
    }

    [Fact]
    public void Nifti2AbsurdDimensionsAreRefused()
    {
        var g = Geometry.Axial(new Size3(2, 2, 2), new Vec3(1, 1, 1), Vec3.Zero);
        var path = _files.PathOf("v2.nii");
        NiftiFile.Write(path, new Volume<float>(g), new NiftiWriteOptions(Version: 2));
        var b = File.ReadAllBytes(path);
        BinaryPrimitives.WriteInt64LittleEndian(b.AsSpan(16 + 8), 1L << 40); // dim[1]
        Assert.Throws<InputLimitException>(() => NiftiFile.Read(Save("v2huge.nii", b)));
    }

    // A gzip bomb: a 6x5x4 float header followed by megabytes of extra (highly compressible) data.
    [Fact]
    public void GzipBombIsRefused()
    {
        var valid = ValidFile();
        var bomb = new byte[valid.Length + (16 << 20)];
        valid.CopyTo(bomb, 0);
        var path = Save("bomb.nii.gz", NiftiTestFiles.Gzip(bomb));
        Assert.True(new FileInfo(path).Length < 100_000);
        var ex = Assert.Throws<InputLimitException>(() => NiftiFile.Read(path));
        Assert.Contains("beyond", ex.Message);
    }

    [Fact]
    public void ComplexAndRgbDataAreUnsupported()
    {
        foreach (short code in new short[] { 32, 128, 1792, 2304, 1 })
        {
            var b = ValidFile();
            BinaryPrimitives.WriteInt16LittleEndian(b.AsSpan(70), code);
            var ex = Assert.Throws<UnsupportedInputException>(() => NiftiFile.Read(Save($"dt{code}.nii", b)));
            Assert.Contains("not supported", ex.Message);
        }
    }

    [Fact]
    public void HeaderImagePairsAndAnalyzeAreRefusedClearly()
    {
        var pair = ValidFile();
        "ni1"u8.CopyTo(pair.AsSpan(344));
        var ex = Assert.Throws<UnsupportedInputException>(() => NiftiFile.Read(Save("pair.nii", pair)));
        Assert.Contains("header/image pair", ex.Message);
        var analyze = ValidFile();
        analyze.AsSpan(344, 4).Clear();
        Assert.Throws<InputFormatException>(() => NiftiFile.Read(Save("analyze.nii", analyze)));
    }

    [Fact]
    public void MissingFileAndBadVolumeIndexAreClear()
    {
        Assert.Throws<InputFormatException>(() => NiftiFile.Read(_files.PathOf("absent.nii")));
        var path = Save("ok.nii", ValidFile());
        Assert.Throws<InvalidParameterException>(() => NiftiFile.ReadVolume(path, -1));
    }

    // Src: common practice (mutation fuzzing): flipped bytes or truncation give a clean read or an InputException.
    [Fact]
    public void MutatedFilesFailCleanlyOrRead()
    {
        var rng = new Random(20261201);
        var plain = ValidFile();
        var gz = ValidFile(gz: true);
        for (int round = 0; round < 300; round++)
        {
            var src = round % 3 == 0 ? gz : plain;
            var b = (byte[])src.Clone();
            int flips = 1 + rng.Next(4);
            for (int f = 0; f < flips; f++)
            {
                int pos = round % 2 == 0 ? rng.Next(Math.Min(b.Length, 352)) : rng.Next(b.Length);
                b[pos] ^= (byte)(1 << rng.Next(8));
            }
            if (rng.Next(5) == 0) b = b[..rng.Next(b.Length)];
            var path = Save(round % 3 == 0 ? "fuzz.nii.gz" : "fuzz.nii", b);
            try
            {
                var image = NiftiFile.Read(path);
                Assert.Equal(image.Geometry.VoxelCount, image.Volume.Voxels.Length);
            }
            catch (InputException e)
            {
                Assert.False(string.IsNullOrWhiteSpace(e.Message));
            }
        }
    }
}
