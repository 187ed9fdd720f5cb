namespace Serimetry.Engine.Io.Dicom;

/// <summary>A transfer syntax (PS3.5 section 10, annex A; UIDs from PS3.6 annex A).</summary>
/// <param name="Uid">The UID.</param>
/// <param name="Name">The PS3.6 name.</param>
/// <param name="Encapsulated">Pixel Data is encapsulated (PS3.5 A.4).</param>
/// <param name="Lossy">The compression may lose information.</param>
public sealed record DicomTransferSyntax(string Uid, string Name, bool Encapsulated, bool Lossy)
{
    public const string ImplicitVRLittleEndian = "1.2.840.10008.1.2";
    public const string ExplicitVRLittleEndian = "1.2.840.10008.1.2.1";
    public const string DeflatedExplicitVRLittleEndian = "1.2.840.10008.1.2.1.99";
    public const string ExplicitVRBigEndian = "1.2.840.10008.1.2.2";

    private static readonly DicomTransferSyntax[] Known =
    [
        new(ImplicitVRLittleEndian, "Implicit VR Little Endian", false, false),
        new(ExplicitVRLittleEndian, "Explicit VR Little Endian", false, false),
        new(DeflatedExplicitVRLittleEndian, "Deflated Explicit VR Little Endian", false, false),
        new(ExplicitVRBigEndian, "Explicit VR Big Endian (retired)", false, false),
        new("1.2.840.10008.1.2.1.98", "Encapsulated Uncompressed Explicit VR Little Endian", true, false),
        new("1.2.840.10008.1.2.4.50", "JPEG Baseline (Process 1)", true, true),
        new("1.2.840.10008.1.2.4.51", "JPEG Extended (Process 2 & 4)", true, true),
        new("1.2.840.10008.1.2.4.57", "JPEG Lossless, Non-Hierarchical (Process 14)", true, false),
        new("1.2.840.10008.1.2.4.70", "JPEG Lossless, Non-Hierarchical, First-Order Prediction (Process 14, Selection Value 1)", true, false),
        new("1.2.840.10008.1.2.4.80", "JPEG-LS Lossless Image Compression", true, false),
        new("1.2.840.10008.1.2.4.81", "JPEG-LS Lossy (Near-Lossless) Image Compression", true, true),
        new("1.2.840.10008.1.2.4.90", "JPEG 2000 Image Compression (Lossless Only)", true, false),
        new("1.2.840.10008.1.2.4.91", "JPEG 2000 Image Compression", true, true),
        new("1.2.840.10008.1.2.4.92", "JPEG 2000 Part 2 Multi-component Image Compression (Lossless Only)", true, false),
        new("1.2.840.10008.1.2.4.93", "JPEG 2000 Part 2 Multi-component Image Compression", true, true),
        new("1.2.840.10008.1.2.4.201", "High-Throughput JPEG 2000 Image Compression (Lossless Only)", true, false),
        new("1.2.840.10008.1.2.4.202", "High-Throughput JPEG 2000 with RPCL Options Image Compression (Lossless Only)", true, false),
        new("1.2.840.10008.1.2.4.203", "High-Throughput JPEG 2000 Image Compression", true, true),
        new("1.2.840.10008.1.2.4.100", "MPEG2 Main Profile / Main Level", true, true),
        new("1.2.840.10008.1.2.4.102", "MPEG-4 AVC/H.264 High Profile / Level 4.1", true, true),
        new("1.2.840.10008.1.2.4.110", "JPEG XL Lossless", true, false),
        new("1.2.840.10008.1.2.4.112", "JPEG XL", true, true),
        new("1.2.840.10008.1.2.5", "RLE Lossless", true, false),
        new("1.2.840.10008.1.2.8.1", "Deflated Image Frame Compression", true, false),
    ];

    /// <summary>The transfer syntax of a UID; unknown UIDs are treated as encapsulated Explicit VR Little Endian (PS3.5 A.4).</summary>
    public static DicomTransferSyntax Of(string uid) =>
        Array.Find(Known, t => t.Uid == uid) ?? new DicomTransferSyntax(uid, "unknown transfer syntax", true, false);

    /// <summary>The data set is Implicit VR (only Implicit VR Little Endian, PS3.5 A.1).</summary>
    public bool ImplicitVR => Uid == ImplicitVRLittleEndian;

    /// <summary>The data set is big endian (PS3.5 A.3).</summary>
    public bool BigEndian => Uid == ExplicitVRBigEndian;

    /// <summary>The data set after the File Meta is deflated (PS3.5 A.5).</summary>
    public bool Deflated => Uid == DeflatedExplicitVRLittleEndian;

    /// <summary>"name (UID)" for messages.</summary>
    public override string ToString() => $"{Name} ({Uid})";
}
