using System.Buffers.Binary;
using System.Runtime.InteropServices;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Converts stored voxel bytes of any scalar NIfTI datatype, in either byte order, to float32, applying
/// <c>scl_slope</c>/<c>scl_inter</c> (nifti1.h: value = scl_slope·stored + scl_inter, and slope 0 means no scaling).
/// </summary>
internal static class NiftiVoxelDecoder
{
    /// <summary>Decodes <paramref name="dst"/>.Length voxels from <paramref name="raw"/>.</summary>
    public static void Decode(ReadOnlySpan<byte> raw, NiftiDataType type, bool bigEndian, Span<float> dst)
    {
        bool swap = bigEndian == BitConverter.IsLittleEndian;
        switch (type)
        {
            case NiftiDataType.UInt8:
                for (int i = 0; i < dst.Length; i++) dst[i] = raw[i];
                break;
            case NiftiDataType.Int8:
                for (int i = 0; i < dst.Length; i++) dst[i] = (sbyte)raw[i];
                break;
            case NiftiDataType.Int16:
                DecodeInt16(MemoryMarshal.Cast<byte, short>(raw[..(2 * dst.Length)]), swap, dst);
                break;
            case NiftiDataType.UInt16:
                DecodeUInt16(MemoryMarshal.Cast<byte, ushort>(raw[..(2 * dst.Length)]), swap, dst);
                break;
            case NiftiDataType.Int32:
                var i32 = MemoryMarshal.Cast<byte, int>(raw[..(4 * dst.Length)]);
                for (int i = 0; i < dst.Length; i++) dst[i] = swap ? BinaryPrimitives.ReverseEndianness(i32[i]) : i32[i];
                break;
            case NiftiDataType.UInt32:
                var u32 = MemoryMarshal.Cast<byte, uint>(raw[..(4 * dst.Length)]);
                for (int i = 0; i < dst.Length; i++) dst[i] = swap ? BinaryPrimitives.ReverseEndianness(u32[i]) : u32[i];
                break;
            case NiftiDataType.Int64:
                var i64 = MemoryMarshal.Cast<byte, long>(raw[..(8 * dst.Length)]);
                for (int i = 0; i < dst.Length; i++) dst[i] = swap ? BinaryPrimitives.ReverseEndianness(i64[i]) : i64[i];
                break;
            case NiftiDataType.UInt64:
                var u64 = MemoryMarshal.Cast<byte, ulong>(raw[..(8 * dst.Length)]);
                for (int i = 0; i < dst.Length; i++) dst[i] = swap ? BinaryPrimitives.ReverseEndianness(u64[i]) : u64[i];
                break;
            case NiftiDataType.Float32:
                DecodeFloat32(raw[..(4 * dst.Length)], swap, dst);
                break;
            case NiftiDataType.Float64:
                var f64 = MemoryMarshal.Cast<byte, long>(raw[..(8 * dst.Length)]);
                for (int i = 0; i < dst.Length; i++)
                    dst[i] = (float)BitConverter.Int64BitsToDouble(swap ? BinaryPrimitives.ReverseEndianness(f64[i]) : f64[i]);
                break;
            default:
                throw new ArgumentOutOfRangeException(nameof(type), type, "not a scalar datatype the decoder handles");
        }
    }

    /// <summary>Applies the header's linear scaling in place (double arithmetic, one rounding to float).</summary>
    public static void Scale(Span<float> values, double slope, double inter)
    {
        if (!IsScaling(slope, inter)) return;
        for (int i = 0; i < values.Length; i++) values[i] = (float)(slope * values[i] + inter);
    }

    /// <summary>Whether scl_slope/scl_inter change values: slope 0 (or non-finite) means "none" (nifti1.h).</summary>
    public static bool IsScaling(double slope, double inter) =>
        slope != 0 && double.IsFinite(slope) && double.IsFinite(inter) && !(slope == 1 && inter == 0);

    private static void DecodeInt16(ReadOnlySpan<short> s, bool swap, Span<float> dst)
    {
        if (swap) for (int i = 0; i < dst.Length; i++) dst[i] = BinaryPrimitives.ReverseEndianness(s[i]);
        else for (int i = 0; i < dst.Length; i++) dst[i] = s[i];
    }

    private static void DecodeUInt16(ReadOnlySpan<ushort> s, bool swap, Span<float> dst)
    {
        if (swap) for (int i = 0; i < dst.Length; i++) dst[i] = BinaryPrimitives.ReverseEndianness(s[i]);
        else for (int i = 0; i < dst.Length; i++) dst[i] = s[i];
    }

    private static void DecodeFloat32(ReadOnlySpan<byte> raw, bool swap, Span<float> dst)
    {
        if (!swap)
        {
            MemoryMarshal.Cast<byte, float>(raw).CopyTo(dst);
            return;
        }
        var bits = MemoryMarshal.Cast<byte, int>(raw);
        for (int i = 0; i < dst.Length; i++) dst[i] = BitConverter.Int32BitsToSingle(BinaryPrimitives.ReverseEndianness(bits[i]));
    }
}
