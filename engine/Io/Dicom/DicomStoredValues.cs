using System.Buffers.Binary;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Extracts stored values from native little-endian frame bytes (PS3.5 8.1.1): the Bits Stored bits
/// ending at High Bit, sign-extended from the top stored bit when Pixel Representation is 1.
/// </summary>
internal static class DicomStoredValues
{
    public static void Extract(ReadOnlySpan<byte> frame, DicomImagePixelInfo info, Span<int> dest)
    {
        var shift = info.HighBit + 1 - info.BitsStored;
        var bits = info.BitsStored;
        var signed = info.PixelRepresentation == 1;
        switch (info.BitsAllocated)
        {
            case 1:
                for (var i = 0; i < dest.Length; i++) dest[i] = (frame[i >> 3] >> (i & 7)) & 1;
                return;
            case 8:
                for (var i = 0; i < dest.Length; i++) dest[i] = Fix(frame[i], shift, bits, signed);
                return;
            case 16:
                if (BitConverter.IsLittleEndian)
                {
                    Extract16(MemoryMarshal.Cast<byte, ushort>(frame[..(2 * dest.Length)]), shift, bits, signed, dest);
                    return;
                }
                for (var i = 0; i < dest.Length; i++)
                    dest[i] = Fix(BinaryPrimitives.ReadUInt16LittleEndian(frame[(2 * i)..]), shift, bits, signed);
                return;
            default:
                for (var i = 0; i < dest.Length; i++)
                    dest[i] = Fix(BinaryPrimitives.ReadUInt32LittleEndian(frame[(4 * i)..]), shift, bits, signed);
                return;
        }
    }

    /// <summary>16-bit samples, eight at a time: widen, shift High Bit down, mask, sign-extend by shifting up and back.</summary>
    private static void Extract16(ReadOnlySpan<ushort> src, int shift, int bits, bool signed, Span<int> dest)
    {
        var up = 32 - bits;
        var i = 0;
        if (Vector128.IsHardwareAccelerated)
        {
            var mask = Vector128.Create(bits >= 32 ? uint.MaxValue : (1u << bits) - 1);
            for (; i + 8 <= src.Length; i += 8)
            {
                var (lo, hi) = Vector128.Widen(Vector128.Create(src.Slice(i, 8)));
                Store(lo, dest.Slice(i, 4));
                Store(hi, dest.Slice(i + 4, 4));
            }

            void Store(Vector128<uint> v, Span<int> d)
            {
                var x = (v >>> shift) & mask;
                var r = signed ? (x.AsInt32() << up) >> up : x.AsInt32();
                r.CopyTo(d);
            }
        }
        for (; i < src.Length; i++) dest[i] = Fix(src[i], shift, bits, signed);
    }

    private static int Fix(uint raw, int shift, int bits, bool signed)
    {
        var v = raw >> shift;
        if (bits >= 32) return (int)v;
        v &= (1u << bits) - 1;
        return signed ? ((int)(v << (32 - bits))) >> (32 - bits) : (int)v;
    }
}
