namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// NIfTI <c>datatype</c> codes (nifti1.h, "DT_*"/"NIFTI_TYPE_*" definitions; the same codes in NIfTI-2).
/// </summary>
public enum NiftiDataType : short
{
    None = 0,
    Binary = 1,
    UInt8 = 2,
    Int16 = 4,
    Int32 = 8,
    Float32 = 16,
    Complex64 = 32,
    Float64 = 64,
    Rgb24 = 128,
    Int8 = 256,
    UInt16 = 512,
    UInt32 = 768,
    Int64 = 1024,
    UInt64 = 1280,
    Float128 = 1536,
    Complex128 = 1792,
    Complex256 = 2048,
    Rgba32 = 2304,
}

/// <summary>Facts about NIfTI data types used by the reader and writer.</summary>
internal static class NiftiDataTypes
{
    /// <summary>Bytes per voxel of a scalar type Serimetry reads; 0 for a type it refuses.</summary>
    public static int BytesPerVoxel(NiftiDataType t) => t switch
    {
        NiftiDataType.UInt8 or NiftiDataType.Int8 => 1,
        NiftiDataType.Int16 or NiftiDataType.UInt16 => 2,
        NiftiDataType.Int32 or NiftiDataType.UInt32 or NiftiDataType.Float32 => 4,
        NiftiDataType.Int64 or NiftiDataType.UInt64 or NiftiDataType.Float64 => 8,
        _ => 0,
    };

    /// <summary>Whether the type holds integers (so a mask may be stored in it without rounding).</summary>
    public static bool IsInteger(NiftiDataType t) => t is not (NiftiDataType.Float32 or NiftiDataType.Float64);

    /// <summary>Lower-case name used in messages and summaries.</summary>
    public static string Name(NiftiDataType t) => Enum.IsDefined(t) ? t.ToString().ToLowerInvariant() : $"code {(short)t}";
}
