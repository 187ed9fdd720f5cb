using Serimetry.Engine.Core;
using Serimetry.Engine.Io.MetaImage;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>
/// The MetaImage header as ITK reads it (from memory of ITK's MetaImageIO: TransformMatrix holds the
/// direction of index axis 0, then 1, then 2; Offset is the first voxel centre; raw data little-endian,
/// x fastest).
/// </summary>
public class MetaImageWriterTests
{
    [Fact]
    public void HeaderAndDataDescribeTheVolume()
    {
        // An oblique grid: index axis 0 runs along LPS (0, 1, 0), axis 1 along (−1, 0, 0), axis 2 along z.
        var dir = Mat3.FromColumns(new Vec3(0, 1, 0), new Vec3(-1, 0, 0), new Vec3(0, 0, 1));
        var g = new Geometry(new Size3(3, 2, 2), new Vec3(0.5, 0.75, 3), new Vec3(-10, 20.5, 7), dir);
        var v = new Volume<float>(g);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = i * 1.5f;
        var dirPath = Path.Combine(Path.GetTempPath(), $"serimetry-mhd-{Guid.NewGuid():N}");
        Directory.CreateDirectory(dirPath);
        try
        {
            var header = Path.Combine(dirPath, "image.mhd");
            MetaImageWriter.Write(header, v);
            var lines = File.ReadAllLines(header).ToDictionary(l => l.Split(" = ")[0], l => l.Split(" = ")[1]);
            Assert.Equal("0 1 0 -1 0 0 0 0 1", lines["TransformMatrix"]);
            Assert.Equal("-10 20.5 7", lines["Offset"]);
            Assert.Equal("0.5 0.75 3", lines["ElementSpacing"]);
            Assert.Equal("3 2 2", lines["DimSize"]);
            Assert.Equal("MET_FLOAT", lines["ElementType"]);
            Assert.Equal("image.raw", lines["ElementDataFile"]);
            var raw = File.ReadAllBytes(Path.Combine(dirPath, "image.raw"));
            Assert.Equal(12 * 4, raw.Length);
            Assert.Equal(7 * 1.5f, BitConverter.ToSingle(raw, 7 * 4));
        }
        finally
        {
            Directory.Delete(dirPath, true);
        }
    }
}
