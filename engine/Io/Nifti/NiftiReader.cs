using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Reads single-file NIfTI-1/NIfTI-2 datasets (.nii, .nii.gz). Every size is checked against the header
/// and <see cref="Limits"/> before allocation; the voxel data is streamed in chunks and decoded to float32.
/// </summary>
internal static class NiftiReader
{
    /// <summary>Decompressed bytes tolerated after the declared voxel data before a stream counts as a bomb.</summary>
    public const long TrailingSlackBytes = 1 << 20;

    private const int ChunkBytes = 1 << 20;

    public static (NiftiHeader Header, NiftiLayout Layout, List<string> Warnings) ReadHeader(NiftiSource src)
    {
        Span<byte> buf = stackalloc byte[NiftiHeaderCodec.Nifti2Size];
        src.ReadExactly(buf[..4], "NIfTI header");
        var (version, bigEndian) = NiftiHeaderCodec.Detect(buf[..4], src.Where);
        int size = version == 1 ? NiftiHeaderCodec.Nifti1Size : NiftiHeaderCodec.Nifti2Size;
        src.ReadExactly(buf[4..size], "NIfTI header");
        var header = NiftiHeaderCodec.Decode(buf[..size], version, bigEndian);
        var warnings = new List<string>();
        var layout = NiftiLayout.From(header, src.Where, warnings);
        return (header, layout, warnings);
    }

    /// <summary>Reads <paramref name="count"/> volumes from <paramref name="first"/>; count &lt; 0 reads all.</summary>
    public static NiftiImage Read(string path, int first, int count)
    {
        using var src = NiftiSource.Open(path);
        var (h, layout, warnings) = ReadHeader(src);
        (first, count) = CheckRange(layout, first, count, path);
        var (geometry, source) = NiftiOrientation.ToGeometry(h, layout.Size, warnings, path);
        long dataEnd = h.VoxOffset + layout.VolumeBytes * layout.VolumeCount;
        if (!src.IsCompressed && src.FileLength < dataEnd)
            throw new InputFormatException(
                $"the file has {src.FileLength:N0} bytes but its header declares {dataEnd:N0} (vox_offset {h.VoxOffset} + {layout.VolumeCount} volume(s) of {layout.Size} {NiftiDataTypes.Name(h.DataType)})",
                path, "the file is truncated; copy or export it again");
        src.Skip(h.VoxOffset - src.Position, "header extensions");
        src.Skip(first * layout.VolumeBytes, "voxel data");
        var volumes = new List<Volume<float>>(count);
        for (int v = 0; v < count; v++) volumes.Add(ReadVolumeData(src, h, layout, geometry));
        if (src.IsCompressed) CheckStreamEnd(src, layout, first + count, warnings);
        return new NiftiImage(volumes, h, source, first, layout.VolumeCount, warnings);
    }

    private static (int First, int Count) CheckRange(NiftiLayout layout, int first, int count, string where)
    {
        if (count < 0)
        {
            if (layout.Size.Count * layout.VolumeCount > Limits.MaxVoxels)
                throw new InputLimitException(
                    $"reading all {layout.VolumeCount} volumes of {layout.Size} exceeds the limit of {Limits.MaxVoxels:N0} voxels",
                    where, "read one volume at a time (NiftiFile.ReadVolume)");
            return (0, layout.VolumeCount);
        }
        if (first < 0 || first >= layout.VolumeCount)
            throw new InvalidParameterException(
                $"volume index {first} is out of range: the file holds {layout.VolumeCount} volume(s) (0..{layout.VolumeCount - 1})",
                where, "choose an index within the range");
        return (first, Math.Min(count, layout.VolumeCount - first));
    }

    private static Volume<float> ReadVolumeData(NiftiSource src, NiftiHeader h, NiftiLayout layout, Geometry geometry)
    {
        var voxels = new float[layout.Size.Count];
        int perChunk = ChunkBytes / layout.BytesPerVoxel;
        var raw = new byte[(int)Math.Min(layout.VolumeBytes, (long)perChunk * layout.BytesPerVoxel)];
        for (int start = 0; start < voxels.Length; start += perChunk)
        {
            int n = Math.Min(perChunk, voxels.Length - start);
            var bytes = raw.AsSpan(0, n * layout.BytesPerVoxel);
            src.ReadExactly(bytes, "voxel data");
            NiftiVoxelDecoder.Decode(bytes, h.DataType, h.BigEndian, voxels.AsSpan(start, n));
        }
        NiftiVoxelDecoder.Scale(voxels, h.SclSlope, h.SclInter);
        return new Volume<float>(geometry, voxels);
    }

    /// <summary>
    /// Reads through the rest of a gzip stream: the remaining declared volumes must be present (else the file
    /// is truncated) and at most <see cref="TrailingSlackBytes"/> may follow (else the stream is refused as a
    /// decompression bomb). Reading stops one chunk after the limit, so a huge stream cannot hang the reader.
    /// </summary>
    private static void CheckStreamEnd(NiftiSource src, NiftiLayout layout, int volumesConsumed, List<string> warnings)
    {
        src.Skip((layout.VolumeCount - volumesConsumed) * layout.VolumeBytes, "voxel data");
        long extra = src.CountRemaining(TrailingSlackBytes);
        if (extra > TrailingSlackBytes)
            throw new InputLimitException(
                $"the decompressed stream continues more than {TrailingSlackBytes:N0} bytes beyond the {src.Position - extra:N0} bytes its header declares",
                src.Where, "the file is not a consistent NIfTI dataset (possibly a decompression bomb); it was not loaded");
        src.CheckGzipTrailer();
        if (extra > 0)
            warnings.Add(string.Create(CultureInfo.InvariantCulture, $"{extra} bytes after the declared voxel data were ignored"));
    }
}
