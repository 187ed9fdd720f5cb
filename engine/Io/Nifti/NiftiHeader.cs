namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// The fields of a NIfTI-1 (348-byte) or NIfTI-2 (540-byte) header that Serimetry uses, as stored in the
/// file (RAS world coordinates, nifti1.h / nifti2.h field names). Geometry in the engine's LPS frame is
/// derived from these by <see cref="NiftiOrientation"/>; this record keeps the file's own view.
/// </summary>
public sealed record NiftiHeader
{
    /// <summary>1 for NIfTI-1 (<c>sizeof_hdr</c> 348), 2 for NIfTI-2 (<c>sizeof_hdr</c> 540).</summary>
    public int Version { get; init; } = 1;

    /// <summary>Whether the file was written big-endian (detected from <c>sizeof_hdr</c>).</summary>
    public bool BigEndian { get; init; }

    /// <summary><c>dim[0..7]</c>: dim[0] is the number of dimensions, dim[1..3] the spatial sizes, dim[4] the volumes.</summary>
    public IReadOnlyList<long> Dim { get; init; } = [3, 1, 1, 1, 1, 1, 1, 1];

    /// <summary><c>pixdim[0..7]</c>: pixdim[0] is qfac (±1), pixdim[1..3] voxel sizes, pixdim[4] the time step.</summary>
    public IReadOnlyList<double> PixDim { get; init; } = [1, 1, 1, 1, 0, 0, 0, 0];

    public NiftiDataType DataType { get; init; }

    public int BitPix { get; init; }

    /// <summary>Byte offset of the voxel data in a single-file (<c>n+1</c>/<c>n+2</c>) dataset.</summary>
    public long VoxOffset { get; init; }

    /// <summary><c>scl_slope</c>; 0 means "no scaling" (nifti1.h).</summary>
    public double SclSlope { get; init; }

    public double SclInter { get; init; }

    /// <summary><c>qform_code</c>: 0 unknown, 1 scanner, 2 aligned, 3 Talairach, 4 MNI.</summary>
    public int QformCode { get; init; }

    /// <summary><c>sform_code</c>, same meanings; when &gt; 0 the sform wins.</summary>
    public int SformCode { get; init; }

    public double QuaternB { get; init; }
    public double QuaternC { get; init; }
    public double QuaternD { get; init; }
    public double QoffsetX { get; init; }
    public double QoffsetY { get; init; }
    public double QoffsetZ { get; init; }

    /// <summary><c>srow_x</c>, <c>srow_y</c>, <c>srow_z</c>: rows of the 3x4 sform affine (RAS).</summary>
    public IReadOnlyList<double> SrowX { get; init; } = [0, 0, 0, 0];
    public IReadOnlyList<double> SrowY { get; init; } = [0, 0, 0, 0];
    public IReadOnlyList<double> SrowZ { get; init; } = [0, 0, 0, 0];

    /// <summary><c>xyzt_units</c>: bits 0-2 spatial (1 m, 2 mm, 3 µm), bits 3-5 temporal.</summary>
    public int XyztUnits { get; init; }

    /// <summary>The <c>magic</c> string without NULs: <c>n+1</c>, <c>ni1</c>, <c>n+2</c>, <c>ni2</c>.</summary>
    public string Magic { get; init; } = "n+1";

    /// <summary>Number of spatial dimensions used (dim[0], 1..7).</summary>
    public int Rank => (int)Dim[0];

    /// <summary>Extent along axis <paramref name="axis"/> (1-based as in dim[]); 1 beyond dim[0].</summary>
    public long Extent(int axis) => axis <= Rank ? Dim[axis] : 1;

    /// <summary>Number of 3D volumes: the product of dim[4..dim[0]].</summary>
    public long VolumeCount
    {
        get
        {
            long n = 1;
            for (int a = 4; a <= 7; a++) n = checked(n * Extent(a));
            return n;
        }
    }

    /// <summary>Spatial unit factor to millimetres from <c>xyzt_units</c> (unknown is taken as mm).</summary>
    public double SpatialUnitToMm => (XyztUnits & 0x07) switch
    {
        1 => 1000.0,
        3 => 0.001,
        _ => 1.0,
    };
}
