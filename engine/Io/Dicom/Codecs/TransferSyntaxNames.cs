namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>Names of compressed transfer syntaxes (DICOM PS3.6 Table A-1), for error messages.</summary>
internal static class TransferSyntaxNames
{
    private static readonly Dictionary<string, string> Names = new()
    {
        ["1.2.840.10008.1.2.4.50"] = "JPEG Baseline (Process 1), lossy",
        ["1.2.840.10008.1.2.4.51"] = "JPEG Extended (Process 2 & 4), lossy",
        ["1.2.840.10008.1.2.4.57"] = "JPEG Lossless, Non-Hierarchical (Process 14)",
        ["1.2.840.10008.1.2.4.70"] = "JPEG Lossless, Non-Hierarchical, First-Order Prediction (Process 14, Selection Value 1)",
        ["1.2.840.10008.1.2.4.80"] = "JPEG-LS Lossless",
        ["1.2.840.10008.1.2.4.81"] = "JPEG-LS Lossy (Near-Lossless)",
        ["1.2.840.10008.1.2.4.90"] = "JPEG 2000 Image Compression (Lossless Only)",
        ["1.2.840.10008.1.2.4.91"] = "JPEG 2000 Image Compression, possibly lossy",
        ["1.2.840.10008.1.2.4.92"] = "JPEG 2000 Part 2 Multi-component (Lossless Only)",
        ["1.2.840.10008.1.2.4.93"] = "JPEG 2000 Part 2 Multi-component, possibly lossy",
        ["1.2.840.10008.1.2.4.201"] = "High-Throughput JPEG 2000 (Lossless Only)",
        ["1.2.840.10008.1.2.4.202"] = "High-Throughput JPEG 2000 with RPCL Options (Lossless Only)",
        ["1.2.840.10008.1.2.4.203"] = "High-Throughput JPEG 2000, possibly lossy",
        ["1.2.840.10008.1.2.4.100"] = "MPEG2 video",
        ["1.2.840.10008.1.2.4.102"] = "MPEG-4 AVC/H.264 video",
        ["1.2.840.10008.1.2.4.107"] = "HEVC/H.265 video",
        ["1.2.840.10008.1.2.5"] = "RLE Lossless",
        ["1.2.840.10008.1.2.8.1"] = "Deflated Image Frame Compression",
    };

    /// <summary>"Name (UID)" when the UID is known, else "transfer syntax UID".</summary>
    public static string Describe(string uid) =>
        Names.TryGetValue(uid, out var name) ? $"{name} ({uid})" : $"transfer syntax {uid}";
}
