namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Safety limits for reading .zip archives, checked against the central directory before anything is
/// inflated and again while inflating (declared sizes may lie).
/// </summary>
/// <param name="MaxEntries">Most entries one archive may hold.</param>
/// <param name="MaxEntryBytes">Largest uncompressed size of one entry (a DICOM file).</param>
/// <param name="MaxTotalBytes">Largest total uncompressed size of all entries read.</param>
/// <param name="MaxCompressionRatio">Largest uncompressed/compressed ratio of an entry larger than <paramref name="RatioCheckFromBytes"/>.</param>
/// <param name="RatioCheckFromBytes">Entries smaller than this are not ratio-checked (tiny files compress well and harm nothing).</param>
public sealed record ZipLimits(
    int MaxEntries = 100_000,
    long MaxEntryBytes = 512L << 20,
    long MaxTotalBytes = 8L << 30,
    double MaxCompressionRatio = 100,
    long RatioCheckFromBytes = 1L << 20)
{
    public static readonly ZipLimits Default = new();
}
