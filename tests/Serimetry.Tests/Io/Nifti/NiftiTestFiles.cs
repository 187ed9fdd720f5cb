using System.Buffers.Binary;
using System.IO.Compression;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;

namespace Serimetry.Tests.Io.Nifti;

/// <summary>A scratch folder for NIfTI tests, deleted afterwards, plus byte-level helpers.</summary>
public sealed class NiftiTestFiles : IDisposable
{
    private readonly ScratchFolder _folder = new("serimetry-nifti-");

    public string Dir => _folder.Dir;

    public string PathOf(string name) => _folder.PathOf(name);

    public void Dispose() => _folder.Dispose();

    /// <summary>A single-file NIfTI-1 dataset with a header built by the writer and caller-supplied voxel bytes.</summary>
    public string Craft(string name, Geometry g, NiftiDataType type, byte[] voxelBytes, int volumes = 1)
    {
        var header = NiftiWriter.BuildHeader(g, volumes, type, NiftiWriteOptions.Default);
        var path = PathOf(name);
        using var f = File.Create(path);
        f.Write(NiftiHeaderCodec.Encode(header));
        f.Write(voxelBytes);
        return path;
    }

    /// <summary>Overwrites little-endian fields of an uncompressed NIfTI-1 file at nifti1.h offsets.</summary>
    public static void PatchInt16(string path, int offset, short value)
    {
        var b = File.ReadAllBytes(path);
        BinaryPrimitives.WriteInt16LittleEndian(b.AsSpan(offset), value);
        File.WriteAllBytes(path, b);
    }

    public static void PatchFloat(string path, int offset, float value)
    {
        var b = File.ReadAllBytes(path);
        BinaryPrimitives.WriteSingleLittleEndian(b.AsSpan(offset), value);
        File.WriteAllBytes(path, b);
    }

    public static void PatchInt32(string path, int offset, int value)
    {
        var b = File.ReadAllBytes(path);
        BinaryPrimitives.WriteInt32LittleEndian(b.AsSpan(offset), value);
        File.WriteAllBytes(path, b);
    }

    public static byte[] Gzip(byte[] data)
    {
        using var ms = new MemoryStream();
        using (var gz = new GZipStream(ms, CompressionLevel.SmallestSize, leaveOpen: true)) gz.Write(data);
        return ms.ToArray();
    }

    public static void AssertGeometryClose(Geometry expected, Geometry actual, double tol = 1e-5)
    {
        Xunit.Assert.Equal(expected.Size, actual.Size);
        Xunit.Assert.True((expected.SpacingMm - actual.SpacingMm).Norm <= tol, $"spacing {actual.SpacingMm} vs {expected.SpacingMm}");
        Xunit.Assert.True((expected.OriginMm - actual.OriginMm).Norm <= tol * Math.Max(1, expected.OriginMm.Norm),
            $"origin {actual.OriginMm} vs {expected.OriginMm}");
        Xunit.Assert.True(expected.Direction.MaxAbsDifference(actual.Direction) <= tol, $"direction {actual.Direction} vs {expected.Direction}");
    }
}
