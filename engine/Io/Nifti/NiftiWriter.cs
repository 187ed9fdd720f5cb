using System.IO.Compression;
using System.Runtime.InteropServices;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Writes single-file NIfTI-1 (or NIfTI-2) datasets, little-endian, with BOTH the qform (quaternion,
/// qfac = pixdim[0]) and the sform (srow_x/y/z) describing the same RAS mapping, xyzt_units = mm, and
/// scl_slope 1 / scl_inter 0. The file is written beside the target and renamed into place, so a failed
/// write never leaves a half-written file under the requested name.
/// </summary>
internal static class NiftiWriter
{
    public static void Write<T>(string path, IReadOnlyList<Volume<T>> volumes, NiftiDataType type, NiftiWriteOptions options)
        where T : unmanaged
    {
        if (volumes.Count == 0) throw new ArgumentException("At least one volume is needed.", nameof(volumes));
        if (options.Version is not (1 or 2))
            throw new InvalidParameterException($"NIfTI version {options.Version} is not 1 or 2", "NIfTI write options");
        if (!BitConverter.IsLittleEndian) throw new PlatformNotSupportedException("The NIfTI writer assumes a little-endian machine.");
        var geometry = volumes[0].Geometry;
        for (int v = 1; v < volumes.Count; v++) geometry.RequireCongruent(volumes[v].Geometry, "volumes of one NIfTI dataset");
        var header = BuildHeader(geometry, volumes.Count, type, options);
        bool compress = options.Compress ?? path.EndsWith(".gz", StringComparison.OrdinalIgnoreCase);
        string partial = path + ".partial";
        try
        {
            using (var file = new FileStream(partial, FileMode.Create, FileAccess.Write, FileShare.None, 1 << 16))
            using (var stream = compress ? new GZipStream(file, CompressionLevel.Optimal, leaveOpen: true) : (Stream)file)
            {
                stream.Write(NiftiHeaderCodec.Encode(header));
                foreach (var volume in volumes) stream.Write(MemoryMarshal.AsBytes(volume.Voxels.AsSpan()));
            }
            File.Move(partial, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(partial)) File.Delete(partial);
        }
    }

    /// <summary>The header describing <paramref name="g"/> in RAS (A_RAS = diag(−1,−1,1)·A_LPS).</summary>
    public static NiftiHeader BuildHeader(Geometry g, int volumeCount, NiftiDataType type, NiftiWriteOptions options)
    {
        var (m, t) = NiftiOrientation.ToRasAffine(g);
        var (b, c, d, qfac, offset) = NiftiOrientation.ToQform(g);
        int rank = volumeCount > 1 ? 4 : 3;
        return new NiftiHeader
        {
            Version = options.Version,
            Dim = [rank, g.Size.X, g.Size.Y, g.Size.Z, volumeCount, 1, 1, 1],
            PixDim = [qfac, g.SpacingMm.X, g.SpacingMm.Y, g.SpacingMm.Z, volumeCount > 1 ? 1 : 0, 0, 0, 0],
            DataType = type,
            BitPix = 8 * NiftiDataTypes.BytesPerVoxel(type),
            VoxOffset = (options.Version == 1 ? NiftiHeaderCodec.Nifti1Size : NiftiHeaderCodec.Nifti2Size) + 4,
            SclSlope = 1,
            SclInter = 0,
            XyztUnits = 2, // NIFTI_UNITS_MM
            QformCode = (int)options.XformCode,
            SformCode = (int)options.XformCode,
            QuaternB = b, QuaternC = c, QuaternD = d,
            QoffsetX = offset.X, QoffsetY = offset.Y, QoffsetZ = offset.Z,
            SrowX = [m.M00, m.M01, m.M02, t.X],
            SrowY = [m.M10, m.M11, m.M12, t.Y],
            SrowZ = [m.M20, m.M21, m.M22, t.Z],
            Magic = options.Version == 1 ? "n+1" : "n+2",
        };
    }
}
