using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Reads and writes NIfTI-1 and NIfTI-2 single-file datasets (.nii, .nii.gz). Geometry is converted
/// from the file's RAS world to the engine's LPS at this boundary (A_LPS = diag(−1,−1,1)·A_RAS), with the
/// sform taking precedence over the qform as nifti1.h specifies. See docs/nifti.md.
/// </summary>
public static class NiftiFile
{
    /// <summary>The header alone, validated (sizes, datatype, magic) but without reading voxels.</summary>
    public static NiftiHeader ReadHeader(string path)
    {
        using var src = NiftiSource.Open(path);
        return NiftiReader.ReadHeader(src).Header;
    }

    /// <summary>The header, its checked geometry and warnings, without reading voxels.</summary>
    internal static (NiftiHeader Header, NiftiLayout Layout, Geometry Geometry, IReadOnlyList<string> Warnings) ReadGeometry(string path)
    {
        using var src = NiftiSource.Open(path);
        var (h, layout, warnings) = NiftiReader.ReadHeader(src);
        var (geometry, _) = NiftiOrientation.ToGeometry(h, layout.Size, warnings, path);
        return (h, layout, geometry, warnings);
    }

    /// <summary>All volumes of the dataset (a 4D DWI stack gives one volume per dim[4] entry).</summary>
    public static NiftiImage Read(string path) => NiftiReader.Read(path, 0, -1);

    /// <summary>One 3D volume (index along dim[4..7], 0-based) of the dataset.</summary>
    public static NiftiImage ReadVolume(string path, int volumeIndex = 0) => NiftiReader.Read(path, volumeIndex, 1);

    /// <summary>
    /// A label mask: every voxel value (after scl_slope/scl_inter) must be an integer in 0..255 and is kept
    /// as its label (0 = outside). Fractional, negative or larger values are refused, never rounded.
    /// </summary>
    public static Volume<byte> ReadMask(string path, int volumeIndex = 0)
    {
        var image = ReadVolume(path, volumeIndex);
        var values = image.Volume.Voxels;
        var mask = image.Volume.Like<byte>();
        var labels = mask.Voxels;
        for (int i = 0; i < values.Length; i++)
        {
            float v = values[i];
            if (v == 0) continue;
            if (!(v >= 1 && v <= 255) || v != MathF.Floor(v))
                throw MaskValueError(path, image.Volume, i, v);
            labels[i] = (byte)v;
        }
        return mask;
    }

    /// <summary>Writes a float32 volume (datatype 16).</summary>
    public static void Write(string path, Volume<float> volume, NiftiWriteOptions? options = null) =>
        NiftiWriter.Write(path, [volume], NiftiDataType.Float32, options ?? NiftiWriteOptions.Default);

    /// <summary>Writes an int16 volume (datatype 4).</summary>
    public static void Write(string path, Volume<short> volume, NiftiWriteOptions? options = null) =>
        NiftiWriter.Write(path, [volume], NiftiDataType.Int16, options ?? NiftiWriteOptions.Default);

    /// <summary>Writes a uint8 volume (datatype 2), e.g. a label mask.</summary>
    public static void Write(string path, Volume<byte> volume, NiftiWriteOptions? options = null) =>
        NiftiWriter.Write(path, [volume], NiftiDataType.UInt8, options ?? NiftiWriteOptions.Default);

    /// <summary>Writes congruent float32 volumes as one 4D dataset (dim[4] = count), e.g. a DWI stack.</summary>
    public static void Write(string path, IReadOnlyList<Volume<float>> volumes, NiftiWriteOptions? options = null) =>
        NiftiWriter.Write(path, volumes, NiftiDataType.Float32, options ?? NiftiWriteOptions.Default);

    private static InputFormatException MaskValueError(string path, Volume<float> v, int linear, float value)
    {
        int nx = v.Size.X, ny = v.Size.Y;
        int i = linear % nx, j = linear / nx % ny, k = linear / (nx * ny);
        return new InputFormatException(
            string.Create(CultureInfo.InvariantCulture,
                $"mask voxel ({i}, {j}, {k}) holds {value}; a mask must hold integer labels 0..255 (0 = outside)"),
            path, "store the mask as integer labels (e.g. uint8), or threshold a probability map before using it as a mask");
    }
}
