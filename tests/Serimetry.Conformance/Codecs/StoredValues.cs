using System.Buffers.Binary;
using System.Security.Cryptography;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// The reference corpus's stored-value convention (shared/reference/dicom/README.md): Bits Stored bits
/// ending at High Bit, sign-extended when Pixel Representation is 1, written little-endian at Bits Allocated
/// width; SHA-256 over that buffer, min, max and mean of the values.
/// </summary>
internal static class StoredValues
{
    public static long[] Extract(ReadOnlySpan<byte> native, int bitsAllocated, int bitsStored, int highBit, int pixelRepresentation)
    {
        int width = bitsAllocated / 8;
        var values = new long[native.Length / width];
        int shift = highBit + 1 - bitsStored;
        long mask = (1L << bitsStored) - 1;
        for (int i = 0; i < values.Length; i++)
        {
            long raw = width switch
            {
                1 => native[i],
                2 => BinaryPrimitives.ReadUInt16LittleEndian(native[(2 * i)..]),
                _ => BinaryPrimitives.ReadUInt32LittleEndian(native[(4 * i)..]),
            };
            long v = (raw >> shift) & mask;
            if (pixelRepresentation == 1 && (v & (1L << (bitsStored - 1))) != 0) v -= 1L << bitsStored;
            values[i] = v;
        }
        return values;
    }

    public static string Sha256(long[] values, int bitsAllocated)
    {
        int width = bitsAllocated / 8;
        var bytes = new byte[values.Length * width];
        for (int i = 0; i < values.Length; i++)
            for (int b = 0; b < width; b++) bytes[i * width + b] = (byte)(values[i] >> (8 * b));
        return Convert.ToHexStringLower(SHA256.HashData(bytes));
    }
}
