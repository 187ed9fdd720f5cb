using System.IO.Compression;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Inflates the data set of Deflated Explicit VR Little Endian (PS3.5 A.5: raw deflate, RFC 1951,
/// without zlib header) with a limit on the inflated size, so a deflate bomb fails fast.
/// </summary>
internal static class DicomInflater
{
    public static ReadOnlyMemory<byte> Inflate(ReadOnlyMemory<byte> compressed, DicomReadLog log)
    {
        var span = compressed.Span;
        // A zlib header (CMF 78h, FCHECK valid) is a known writer error; accept it leniently.
        var zlib = span.Length >= 2 && span[0] == 0x78 && ((span[0] << 8) | span[1]) % 31 == 0;
        if (zlib) log.Lenient("deflated data set carries a zlib header (PS3.5 A.5 requires raw deflate)");
        var limit = log.Options.MaxInflatedBytes;
        using var input = new MemoryStream(compressed.ToArray(), false);
        using Stream inflater = zlib ? new ZLibStream(input, CompressionMode.Decompress) : new DeflateStream(input, CompressionMode.Decompress);
        using var output = new MemoryStream();
        var chunk = new byte[81920];
        try
        {
            int n;
            while ((n = inflater.Read(chunk, 0, chunk.Length)) > 0)
            {
                if (output.Length + n > limit)
                    throw new InputLimitException($"the deflated data set inflates to more than {limit:N0} bytes",
                        log.Source, "the file is corrupt or a deflate bomb; Serimetry stops inflating at this limit");
                output.Write(chunk, 0, n);
            }
        }
        catch (InvalidDataException ex)
        {
            throw new InputFormatException($"the deflated data set is corrupt: {ex.Message}", log.Source,
                "copy the file again or ask the sender for Explicit VR Little Endian", ex);
        }
        return output.GetBuffer().AsMemory(0, (int)output.Length);
    }
}
