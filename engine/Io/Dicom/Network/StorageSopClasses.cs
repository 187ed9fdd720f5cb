namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>SOP classes the receiver accepts (UIDs from PS3.6 annex A; storage classes of PS3.4 annex B.5).</summary>
public static class StorageSopClasses
{
    /// <summary>Verification SOP Class (PS3.4 annex A), answered with C-ECHO-RSP.</summary>
    public const string Verification = "1.2.840.10008.1.1";

    public const string MrImage = "1.2.840.10008.5.1.4.1.1.4";
    public const string EnhancedMrImage = "1.2.840.10008.5.1.4.1.1.4.1";
    public const string Segmentation = "1.2.840.10008.5.1.4.1.1.66.4";
    public const string ComprehensiveSr = "1.2.840.10008.5.1.4.1.1.88.33";
    public const string EnhancedSr = "1.2.840.10008.5.1.4.1.1.88.22";
    public const string SecondaryCapture = "1.2.840.10008.5.1.4.1.1.7";
    public const string RtStructureSet = "1.2.840.10008.5.1.4.1.1.481.3";

    /// <summary>Verification and every storage class accepted by default.</summary>
    public static IReadOnlyList<string> Accepted { get; } =
    [
        Verification,
        MrImage,
        EnhancedMrImage,
        "1.2.840.10008.5.1.4.1.1.4.2", // MR Spectroscopy
        "1.2.840.10008.5.1.4.1.1.4.3", // Enhanced MR Color Image
        "1.2.840.10008.5.1.4.1.1.4.4", // Legacy Converted Enhanced MR Image
        "1.2.840.10008.5.1.4.1.1.2", // CT Image
        "1.2.840.10008.5.1.4.1.1.2.1", // Enhanced CT Image
        "1.2.840.10008.5.1.4.1.1.128", // Positron Emission Tomography Image
        SecondaryCapture,
        "1.2.840.10008.5.1.4.1.1.7.1", // Multi-frame Single Bit Secondary Capture
        "1.2.840.10008.5.1.4.1.1.7.2", // Multi-frame Grayscale Byte Secondary Capture
        "1.2.840.10008.5.1.4.1.1.7.3", // Multi-frame Grayscale Word Secondary Capture
        "1.2.840.10008.5.1.4.1.1.7.4", // Multi-frame True Color Secondary Capture
        Segmentation,
        "1.2.840.10008.5.1.4.1.1.66", // Raw Data
        "1.2.840.10008.5.1.4.1.1.66.1", // Spatial Registration
        "1.2.840.10008.5.1.4.1.1.66.3", // Deformable Spatial Registration
        "1.2.840.10008.5.1.4.1.1.30", // Parametric Map
        "1.2.840.10008.5.1.4.1.1.88.11", // Basic Text SR
        EnhancedSr,
        ComprehensiveSr,
        "1.2.840.10008.5.1.4.1.1.88.34", // Comprehensive 3D SR
        "1.2.840.10008.5.1.4.1.1.88.59", // Key Object Selection Document
        "1.2.840.10008.5.1.4.1.1.11.1", // Grayscale Softcopy Presentation State
        "1.2.840.10008.5.1.4.1.1.104.1", // Encapsulated PDF
        RtStructureSet,
    ];
}

/// <summary>Transfer syntaxes the receiver accepts: the uncompressed ones and the compressed ones the engine decodes.</summary>
public static class NetworkTransferSyntaxes
{
    /// <summary>
    /// Implicit VR LE (the default every peer must offer, PS3.5 10.1), Explicit VR LE, Deflated Explicit VR LE, and
    /// the lossless syntaxes of <see cref="Codecs.CodecRegistry"/>: RLE, JPEG Lossless SV1 and Process 14, JPEG-LS lossless
    /// (JPEG-LS near-lossless is decodable but lossy, so it is not accepted).
    /// </summary>
    public static IReadOnlyList<string> Accepted { get; } =
    [
        DicomTransferSyntax.ImplicitVRLittleEndian,
        DicomTransferSyntax.ExplicitVRLittleEndian,
        DicomTransferSyntax.DeflatedExplicitVRLittleEndian,
        .. Codecs.CodecRegistry.All.SelectMany(d => d.TransferSyntaxUids).Where(uid => !DicomTransferSyntax.Of(uid).Lossy),
    ];
}
