using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;

namespace Serimetry.Tests.Io.Dicom.Codecs;

/// <summary>
/// Arbitrary bytes, bare or behind a plausible codec header, must either decode or raise an input error
/// (format or unsupported) — never an index, overflow or null error, never a hang (common practice: decoder fuzzing).
/// </summary>
public class GarbageInputPropertyTests
{
    private static readonly FrameInfo Info = new(5, 7, 1, 16, 12, 0, 0);

    private static bool DecodesOrRefuses(IFrameDecoder decoder, byte[] data, FrameInfo info)
    {
        try
        {
            decoder.Decode(data, info, new byte[info.DecodedLength]);
            return true;
        }
        catch (InputException e)
        {
            return e is InputFormatException or UnsupportedInputException;
        }
    }

    [Property(MaxTest = 300)]
    public bool JpegLosslessOnGarbage(byte[] tail)
    {
        // SOI, a K.3-shaped table and a 5x7 SOF3 header, then arbitrary bytes.
        byte[] head = [0xFF, 0xD8, 0xFF, 0xC4, 0x00, 0x1F, 0x00, 0, 1, 5, 1, 1, 1, 1, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11,
                       0xFF, 0xC3, 0x00, 0x0B, 12, 0, 5, 0, 7, 1, 1, 0x11, 0, 0xFF, 0xDA, 0x00, 0x08, 1, 1, 0x00, 1, 0, 0];
        return DecodesOrRefuses(new JpegLosslessDecoder(), [.. head, .. tail], Info) && DecodesOrRefuses(new JpegLosslessDecoder(), tail, Info);
    }

    [Property(MaxTest = 300)]
    public bool JpegLsOnGarbage(byte[] tail)
    {
        byte[] head = [0xFF, 0xD8, 0xFF, 0xF7, 0x00, 0x0B, 12, 0, 5, 0, 7, 1, 1, 0x11, 0, 0xFF, 0xDA, 0x00, 0x08, 1, 1, 0, 0, 0, 0];
        return DecodesOrRefuses(new JpegLsDecoder(), [.. head, .. tail], Info) && DecodesOrRefuses(new JpegLsDecoder(), tail, Info);
    }

    [Property(MaxTest = 300)]
    public bool RleOnGarbage(byte[] tail)
    {
        byte[] head = new byte[64];
        head[0] = 2;
        head[4] = 64;
        head[8] = (byte)(64 + tail.Length / 2);
        return DecodesOrRefuses(new RleLosslessDecoder(), [.. head, .. tail], Info) && DecodesOrRefuses(new RleLosslessDecoder(), tail, Info);
    }
}
