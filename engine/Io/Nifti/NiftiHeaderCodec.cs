using System.Buffers.Binary;
using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Decodes and encodes the NIfTI-1 (348-byte) and NIfTI-2 (540-byte) headers at the byte offsets of
/// nifti1.h and nifti2.h. The version and byte order are detected from <c>sizeof_hdr</c>, which must read
/// 348 or 540 in one of the two byte orders (the method nifti1.h recommends).
/// </summary>
internal static class NiftiHeaderCodec
{
    public const int Nifti1Size = 348;
    public const int Nifti2Size = 540;

    /// <summary>Version (1/2) and byte order from the first four bytes; throws when neither matches.</summary>
    public static (int Version, bool BigEndian) Detect(ReadOnlySpan<byte> first4, string where)
    {
        int le = BinaryPrimitives.ReadInt32LittleEndian(first4);
        int be = BinaryPrimitives.ReadInt32BigEndian(first4);
        if (le == Nifti1Size) return (1, false);
        if (be == Nifti1Size) return (1, true);
        if (le == Nifti2Size) return (2, false);
        if (be == Nifti2Size) return (2, true);
        throw new InputFormatException(
            $"not a NIfTI file: sizeof_hdr is {le} (little-endian) / {be} (big-endian), expected 348 (NIfTI-1) or 540 (NIfTI-2)",
            where, "supply a .nii or .nii.gz file");
    }

    public static NiftiHeader Decode(ReadOnlySpan<byte> h, int version, bool bigEndian) =>
        version == 1 ? Decode1(h, new Reader(bigEndian)) with { BigEndian = bigEndian }
                     : Decode2(h, new Reader(bigEndian)) with { BigEndian = bigEndian };

    private static NiftiHeader Decode1(ReadOnlySpan<byte> h, Reader r) => new()
    {
        Version = 1,
        Dim = ReadArray(h, 40, 8, 2, (s, o) => (long)r.I16(s, o)),
        DataType = (NiftiDataType)r.I16(h, 70),
        BitPix = r.I16(h, 72),
        PixDim = ReadArray(h, 76, 8, 4, (s, o) => r.F32(s, o)),
        VoxOffset = (long)Math.Floor(r.F32(h, 108)),
        SclSlope = r.F32(h, 112),
        SclInter = r.F32(h, 116),
        XyztUnits = h[123],
        QformCode = r.I16(h, 252),
        SformCode = r.I16(h, 254),
        QuaternB = r.F32(h, 256), QuaternC = r.F32(h, 260), QuaternD = r.F32(h, 264),
        QoffsetX = r.F32(h, 268), QoffsetY = r.F32(h, 272), QoffsetZ = r.F32(h, 276),
        SrowX = ReadArray(h, 280, 4, 4, (s, o) => r.F32(s, o)),
        SrowY = ReadArray(h, 296, 4, 4, (s, o) => r.F32(s, o)),
        SrowZ = ReadArray(h, 312, 4, 4, (s, o) => r.F32(s, o)),
        Magic = AsciiZ(h.Slice(344, 4)),
    };

    private static NiftiHeader Decode2(ReadOnlySpan<byte> h, Reader r) => new()
    {
        Version = 2,
        Magic = AsciiZ(h.Slice(4, 4)),
        DataType = (NiftiDataType)r.I16(h, 12),
        BitPix = r.I16(h, 14),
        Dim = ReadArray(h, 16, 8, 8, (s, o) => r.I64(s, o)),
        PixDim = ReadArray(h, 104, 8, 8, (s, o) => r.F64(s, o)),
        VoxOffset = r.I64(h, 168),
        SclSlope = r.F64(h, 176),
        SclInter = r.F64(h, 184),
        QformCode = r.I32(h, 344),
        SformCode = r.I32(h, 348),
        QuaternB = r.F64(h, 352), QuaternC = r.F64(h, 360), QuaternD = r.F64(h, 368),
        QoffsetX = r.F64(h, 376), QoffsetY = r.F64(h, 384), QoffsetZ = r.F64(h, 392),
        SrowX = ReadArray(h, 400, 4, 8, (s, o) => r.F64(s, o)),
        SrowY = ReadArray(h, 432, 4, 8, (s, o) => r.F64(s, o)),
        SrowZ = ReadArray(h, 464, 4, 8, (s, o) => r.F64(s, o)),
        XyztUnits = r.I32(h, 500),
    };

    /// <summary>Encodes a little-endian single-file header followed by the 4-byte extension flag (all zero).</summary>
    public static byte[] Encode(NiftiHeader n)
    {
        int size = n.Version == 1 ? Nifti1Size : Nifti2Size;
        var b = new byte[size + 4];
        if (n.Version == 1) Encode1(b, n); else Encode2(b, n);
        return b;
    }

    private static void Encode1(Span<byte> b, NiftiHeader n)
    {
        BinaryPrimitives.WriteInt32LittleEndian(b, Nifti1Size);
        b[38] = (byte)'r';
        for (int i = 0; i < 8; i++) BinaryPrimitives.WriteInt16LittleEndian(b[(40 + 2 * i)..], checked((short)n.Dim[i]));
        BinaryPrimitives.WriteInt16LittleEndian(b[70..], (short)n.DataType);
        BinaryPrimitives.WriteInt16LittleEndian(b[72..], (short)n.BitPix);
        for (int i = 0; i < 8; i++) BinaryPrimitives.WriteSingleLittleEndian(b[(76 + 4 * i)..], (float)n.PixDim[i]);
        BinaryPrimitives.WriteSingleLittleEndian(b[108..], n.VoxOffset);
        BinaryPrimitives.WriteSingleLittleEndian(b[112..], (float)n.SclSlope);
        BinaryPrimitives.WriteSingleLittleEndian(b[116..], (float)n.SclInter);
        b[123] = (byte)n.XyztUnits;
        BinaryPrimitives.WriteInt16LittleEndian(b[252..], (short)n.QformCode);
        BinaryPrimitives.WriteInt16LittleEndian(b[254..], (short)n.SformCode);
        ReadOnlySpan<double> q = [n.QuaternB, n.QuaternC, n.QuaternD, n.QoffsetX, n.QoffsetY, n.QoffsetZ];
        for (int i = 0; i < 6; i++) BinaryPrimitives.WriteSingleLittleEndian(b[(256 + 4 * i)..], (float)q[i]);
        for (int i = 0; i < 4; i++)
        {
            BinaryPrimitives.WriteSingleLittleEndian(b[(280 + 4 * i)..], (float)n.SrowX[i]);
            BinaryPrimitives.WriteSingleLittleEndian(b[(296 + 4 * i)..], (float)n.SrowY[i]);
            BinaryPrimitives.WriteSingleLittleEndian(b[(312 + 4 * i)..], (float)n.SrowZ[i]);
        }
        Encoding.ASCII.GetBytes("n+1").CopyTo(b[344..]);
    }

    private static void Encode2(Span<byte> b, NiftiHeader n)
    {
        BinaryPrimitives.WriteInt32LittleEndian(b, Nifti2Size);
        // magic "n+2\0\r\n\032\n" (nifti2.h): the trailing bytes detect text-mode transfer corruption.
        ReadOnlySpan<byte> magic = [(byte)'n', (byte)'+', (byte)'2', 0, 0x0D, 0x0A, 0x1A, 0x0A];
        magic.CopyTo(b[4..]);
        BinaryPrimitives.WriteInt16LittleEndian(b[12..], (short)n.DataType);
        BinaryPrimitives.WriteInt16LittleEndian(b[14..], (short)n.BitPix);
        for (int i = 0; i < 8; i++) BinaryPrimitives.WriteInt64LittleEndian(b[(16 + 8 * i)..], n.Dim[i]);
        for (int i = 0; i < 8; i++) BinaryPrimitives.WriteDoubleLittleEndian(b[(104 + 8 * i)..], n.PixDim[i]);
        BinaryPrimitives.WriteInt64LittleEndian(b[168..], n.VoxOffset);
        BinaryPrimitives.WriteDoubleLittleEndian(b[176..], n.SclSlope);
        BinaryPrimitives.WriteDoubleLittleEndian(b[184..], n.SclInter);
        BinaryPrimitives.WriteInt32LittleEndian(b[344..], n.QformCode);
        BinaryPrimitives.WriteInt32LittleEndian(b[348..], n.SformCode);
        ReadOnlySpan<double> q = [n.QuaternB, n.QuaternC, n.QuaternD, n.QoffsetX, n.QoffsetY, n.QoffsetZ];
        for (int i = 0; i < 6; i++) BinaryPrimitives.WriteDoubleLittleEndian(b[(352 + 8 * i)..], q[i]);
        for (int i = 0; i < 4; i++)
        {
            BinaryPrimitives.WriteDoubleLittleEndian(b[(400 + 8 * i)..], n.SrowX[i]);
            BinaryPrimitives.WriteDoubleLittleEndian(b[(432 + 8 * i)..], n.SrowY[i]);
            BinaryPrimitives.WriteDoubleLittleEndian(b[(464 + 8 * i)..], n.SrowZ[i]);
        }
        BinaryPrimitives.WriteInt32LittleEndian(b[500..], n.XyztUnits);
    }

    private delegate T FieldReader<T>(ReadOnlySpan<byte> s, int offset);

    private static T[] ReadArray<T>(ReadOnlySpan<byte> h, int offset, int count, int width, FieldReader<T> read)
    {
        var a = new T[count];
        for (int i = 0; i < count; i++) a[i] = read(h, offset + i * width);
        return a;
    }

    private static string AsciiZ(ReadOnlySpan<byte> s)
    {
        int end = s.IndexOf((byte)0);
        return Encoding.ASCII.GetString(end < 0 ? s : s[..end]);
    }

    /// <summary>Reads fields in the file's byte order.</summary>
    private readonly struct Reader(bool bigEndian)
    {
        public short I16(ReadOnlySpan<byte> s, int o) =>
            bigEndian ? BinaryPrimitives.ReadInt16BigEndian(s[o..]) : BinaryPrimitives.ReadInt16LittleEndian(s[o..]);

        public int I32(ReadOnlySpan<byte> s, int o) =>
            bigEndian ? BinaryPrimitives.ReadInt32BigEndian(s[o..]) : BinaryPrimitives.ReadInt32LittleEndian(s[o..]);

        public long I64(ReadOnlySpan<byte> s, int o) =>
            bigEndian ? BinaryPrimitives.ReadInt64BigEndian(s[o..]) : BinaryPrimitives.ReadInt64LittleEndian(s[o..]);

        public double F32(ReadOnlySpan<byte> s, int o) =>
            bigEndian ? BinaryPrimitives.ReadSingleBigEndian(s[o..]) : BinaryPrimitives.ReadSingleLittleEndian(s[o..]);

        public double F64(ReadOnlySpan<byte> s, int o) =>
            bigEndian ? BinaryPrimitives.ReadDoubleBigEndian(s[o..]) : BinaryPrimitives.ReadDoubleLittleEndian(s[o..]);
    }
}
