using System.Buffers.Binary;

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
                if (shift == 0 && bits == 16)
                {
                    for (var i = 0; i < dest.Length; i++)
                    {
                        var raw = BinaryPrimitives.ReadUInt16LittleEndian(frame[(2 * i)..]);
                        dest[i] = signed ? (short)raw : raw;
                    }
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

    private static int Fix(uint raw, int shift, int bits, bool signed)
    {
        var v = raw >> shift;
        if (bits >= 32) return (int)v;
        v &= (1u << bits) - 1;
        return signed ? ((int)(v << (32 - bits))) >> (32 - bits) : (int)v;
    }
}
