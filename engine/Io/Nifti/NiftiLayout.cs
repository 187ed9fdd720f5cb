using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// The checked shape of a NIfTI dataset's voxel data: 3D grid, number of volumes, bytes per voxel and per
/// volume. Built from a header before any voxel allocation, so absurd dimensions are refused up front.
/// </summary>
internal sealed record NiftiLayout(Size3 Size, int VolumeCount, int BytesPerVoxel, long VolumeBytes)
{
    /// <summary>Largest <c>vox_offset</c> accepted (room for header extensions): 64 MiB.</summary>
    public const long MaxVoxOffset = 64L << 20;

    /// <summary>Validates a header and returns its layout; throws a specific <see cref="InputException"/> otherwise.</summary>
    public static NiftiLayout From(NiftiHeader h, string where, List<string> warnings)
    {
        CheckMagic(h, where);
        int bpv = CheckDataType(h, where, warnings);
        var size = CheckDims(h, where);
        long volumes = CheckVolumeCount(h, where);
        long minOffset = h.Version == 1 ? NiftiHeaderCodec.Nifti1Size : NiftiHeaderCodec.Nifti2Size;
        if (h.VoxOffset < minOffset || h.VoxOffset > MaxVoxOffset)
            throw new InputFormatException(
                string.Create(CultureInfo.InvariantCulture, $"vox_offset {h.VoxOffset} is outside the valid range {minOffset}..{MaxVoxOffset}"),
                where, "the header is damaged; export the image again");
        return new NiftiLayout(size, (int)volumes, bpv, size.Count * bpv);
    }

    private static void CheckMagic(NiftiHeader h, string where)
    {
        string single = h.Version == 1 ? "n+1" : "n+2";
        string pair = h.Version == 1 ? "ni1" : "ni2";
        if (h.Magic == single) return;
        if (h.Magic == pair)
            throw new UnsupportedInputException(
                $"this is the header of a NIfTI-{h.Version} header/image pair (magic '{pair}'); Serimetry reads single-file datasets",
                where, "convert it to a single .nii file, e.g. nifti_tool -copy_im -prefix out.nii -infiles in.hdr");
        throw new InputFormatException(
            $"the magic field is '{h.Magic}', expected '{single}' (a single-file NIfTI-{h.Version}); ANALYZE 7.5 files are not read",
            where, "supply a NIfTI .nii or .nii.gz file");
    }

    private static int CheckDataType(NiftiHeader h, string where, List<string> warnings)
    {
        int bpv = NiftiDataTypes.BytesPerVoxel(h.DataType);
        if (bpv == 0)
            throw new UnsupportedInputException(
                $"NIfTI datatype {NiftiDataTypes.Name(h.DataType)} ({(short)h.DataType}) is not supported: Serimetry reads real scalar images (uint8, int8, int16, uint16, int32, uint32, int64, uint64, float32, float64); complex, RGB, binary and float128 data are refused",
                where, "convert the image to a real scalar type (for complex data, e.g. its magnitude) before loading it");
        if (h.BitPix != 8 * bpv)
            warnings.Add(string.Create(CultureInfo.InvariantCulture,
                $"bitpix is {h.BitPix} but datatype {NiftiDataTypes.Name(h.DataType)} has {8 * bpv} bits; the datatype is used"));
        return bpv;
    }

    private static Size3 CheckDims(NiftiHeader h, string where)
    {
        if (h.Rank < 1 || h.Rank > 7)
            throw new InputFormatException($"dim[0] is {h.Dim[0]}, expected 1..7", where, "the header is damaged; export the image again");
        for (int a = 1; a <= h.Rank; a++)
        {
            if (h.Dim[a] < 1)
                throw new InputFormatException($"dim[{a}] is {h.Dim[a]}; every used dimension must be at least 1", where,
                    "the header is damaged; export the image again");
        }
        long x = h.Extent(1), y = h.Extent(2), z = h.Extent(3);
        if (x > Limits.MaxAxisLength || y > Limits.MaxAxisLength || z > Limits.MaxAxisLength)
            throw new InputLimitException($"image size {x}x{y}x{z} exceeds {Limits.MaxAxisLength} voxels per axis", where,
                "check the file is not corrupt; Serimetry refuses such sizes before allocating memory");
        var size = new Size3((int)x, (int)y, (int)z);
        Limits.CheckSize(size, where);
        return size;
    }

    private static long CheckVolumeCount(NiftiHeader h, string where)
    {
        long volumes;
        try
        {
            volumes = h.VolumeCount;
        }
        catch (OverflowException)
        {
            volumes = long.MaxValue;
        }
        if (volumes > Limits.MaxVoxels)
            throw new InputLimitException($"the header declares {volumes:N0} volumes (dim[4..7])", where,
                "check the file is not corrupt; Serimetry refuses such sizes before allocating memory");
        return volumes;
    }
}
