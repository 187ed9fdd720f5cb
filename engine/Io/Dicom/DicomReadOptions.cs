namespace Serimetry.Engine.Io.Dicom;

/// <summary>Options of the DICOM Part 10 reader.</summary>
/// <param name="Strict">
/// When true, deviations from PS3.5/PS3.10 that the reader could work around (odd lengths, missing
/// delimiters, a data set encoded differently from its transfer syntax …) are errors. When false
/// (default) they are worked around and each one is recorded in <see cref="DicomFile.Leniencies"/>.
/// </param>
/// <param name="MaxSequenceDepth">Deepest sequence nesting accepted (guards against stack exhaustion).</param>
/// <param name="MaxInflatedBytes">Largest inflated size of a Deflated data set (guards against deflate bombs).</param>
/// <param name="MaxFileBytes">Largest file or stream read into memory.</param>
public sealed record DicomReadOptions(
    bool Strict = false,
    int MaxSequenceDepth = 64,
    long MaxInflatedBytes = 1L << 30,
    long MaxFileBytes = int.MaxValue - 64)
{
    /// <summary>Lenient defaults.</summary>
    public static DicomReadOptions Default { get; } = new();
}
