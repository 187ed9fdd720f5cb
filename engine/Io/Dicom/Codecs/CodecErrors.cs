using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>Builds the input errors the frame decoders throw, so that messages read alike across codecs.</summary>
internal static class CodecErrors
{
    private const string ReencodeFix =
        "the compressed pixel data is damaged; obtain the image again or an uncompressed copy (e.g. dcmdjpeg / dcmdrle / gdcmconv --raw)";

    /// <summary>A malformed or truncated stream: what went wrong and where in the codestream.</summary>
    public static InputFormatException Malformed(string codec, string what, long offset) =>
        new($"{codec}: {what}", $"compressed frame, byte {offset}", ReencodeFix);

    /// <summary>A well-formed stream that uses a feature this engine does not decode.</summary>
    public static UnsupportedInputException Unsupported(string codec, string what) =>
        new($"{codec}: {what} is not supported", "compressed frame",
            "convert the file to an uncompressed transfer syntax (e.g. dcmdjpeg, dcmdjpls, dcmdrle or gdcmconv --raw) and read that copy");

    /// <summary>The codestream disagrees with the Image Pixel module attributes.</summary>
    public static InputFormatException Mismatch(string codec, string attribute, string expected, string found) =>
        new($"{codec}: the codestream's {attribute} is {found} but the DICOM Image Pixel module says {expected}",
            "compressed frame header", "check the file's Rows, Columns, Samples per Pixel and Bits Allocated against the image; re-export it from the source system");
}
