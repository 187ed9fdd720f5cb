using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>The engine's compressed-frame decoders, looked up by transfer syntax UID.</summary>
public static class CodecRegistry
{
    /// <summary>All decoders written in the engine.</summary>
    public static IReadOnlyList<IFrameDecoder> All { get; } =
    [
        new RleLosslessDecoder(),
        new JpegLosslessDecoder(),
        new JpegLsDecoder(),
    ];

    /// <summary>The decoder for a transfer syntax, or null when the engine has none.</summary>
    public static IFrameDecoder? Find(string transferSyntaxUid) =>
        All.FirstOrDefault(d => d.TransferSyntaxUids.Contains(transferSyntaxUid));

    /// <summary>
    /// The decoder for a compressed transfer syntax; otherwise an <see cref="UnsupportedInputException"/> that
    /// names the syntax (PS3.5 Annex A / PS3.6 Annex A) and says how to obtain an uncompressed copy.
    /// </summary>
    public static IFrameDecoder Require(string transferSyntaxUid, string? where = null) =>
        Find(transferSyntaxUid) ?? throw new UnsupportedInputException(
            $"pixel data compressed with {TransferSyntaxNames.Describe(transferSyntaxUid)} cannot be decoded by this engine " +
            "(it decodes RLE Lossless, JPEG Lossless Process 14 and JPEG-LS Lossless)",
            where,
            "ask the archive (PACS) for an uncompressed or lossless copy, or convert the file, e.g. " +
            "'gdcmconv --raw IN OUT' (GDCM) or 'dcmdjpeg IN OUT' (dcmtk), and read that copy");
}
