using System.Globalization;
using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.MetaImage;

/// <summary>
/// Writes ITK's MetaImage format (a text header <c>.mhd</c> plus raw voxels <c>.raw</c>, little-endian), the
/// open format that ITK-based tools such as elastix read. Header keys per the MetaIO documentation
/// (ObjectType, NDims, DimSize, ElementSpacing, Offset, TransformMatrix, ElementType, ElementDataFile).
/// Coordinates are LPS, as ITK's are. TransformMatrix lists the direction of index axis 0, then axis 1,
/// then axis 2 (the columns of <see cref="Geometry.Direction"/>), which is how ITK's reader fills its
/// direction matrix.
/// </summary>
public static class MetaImageWriter
{
    /// <summary>Writes a float32 image; <paramref name="headerPath"/> ends in .mhd, the data goes beside it as .raw.</summary>
    public static void Write(string headerPath, Volume<float> image) =>
        Write(headerPath, image.Geometry, "MET_FLOAT", System.Runtime.InteropServices.MemoryMarshal.AsBytes(image.Voxels.AsSpan()));

    /// <summary>Writes an unsigned 8-bit image (masks).</summary>
    public static void Write(string headerPath, Volume<byte> image) =>
        Write(headerPath, image.Geometry, "MET_UCHAR", image.Voxels);

    private static void Write(string headerPath, Geometry g, string elementType, ReadOnlySpan<byte> data)
    {
        if (!BitConverter.IsLittleEndian) throw new PlatformNotSupportedException("MetaImage writing assumes a little-endian machine.");
        var rawPath = Path.ChangeExtension(headerPath, ".raw");
        var d = g.Direction;
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.Append("ObjectType = Image\nNDims = 3\nBinaryData = True\nBinaryDataByteOrderMSB = False\nCompressedData = False\n");
        sb.Append(ci, $"TransformMatrix = {R(d.M00)} {R(d.M10)} {R(d.M20)} {R(d.M01)} {R(d.M11)} {R(d.M21)} {R(d.M02)} {R(d.M12)} {R(d.M22)}\n");
        sb.Append(ci, $"Offset = {R(g.OriginMm.X)} {R(g.OriginMm.Y)} {R(g.OriginMm.Z)}\n");
        sb.Append("CenterOfRotation = 0 0 0\n");
        sb.Append(ci, $"ElementSpacing = {R(g.SpacingMm.X)} {R(g.SpacingMm.Y)} {R(g.SpacingMm.Z)}\n");
        sb.Append(ci, $"DimSize = {g.Size.X} {g.Size.Y} {g.Size.Z}\n");
        sb.Append(ci, $"ElementType = {elementType}\n");
        sb.Append(ci, $"ElementDataFile = {Path.GetFileName(rawPath)}\n");
        File.WriteAllText(headerPath, sb.ToString());
        using var fs = File.Create(rawPath);
        fs.Write(data);
    }

    private static string R(double v) => v.ToString("R", CultureInfo.InvariantCulture);
}
