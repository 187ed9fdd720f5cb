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
}
