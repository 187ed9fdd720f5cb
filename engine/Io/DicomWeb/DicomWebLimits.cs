using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// Safety limits on what a DICOMweb server may send, checked while streaming (declared lengths may lie). The
/// per-instance and total sizes are those of an uploaded archive (<see cref="ZipLimits"/>), so a study is bounded
/// the same way whichever door it comes through.
/// </summary>
/// <param name="MaxParts">Most instances (multipart parts) one retrieve may hold.</param>
/// <param name="MaxPartBytes">Largest single instance (one part's body).</param>
/// <param name="MaxTotalBytes">Largest total of all parts of one retrieve.</param>
/// <param name="MaxHeaderBytes">Largest header block of one part.</param>
/// <param name="MaxJsonBytes">Largest QIDO-RS or STOW-RS JSON response.</param>
public sealed record DicomWebLimits(
    int MaxParts = 100_000,
    long MaxPartBytes = 512L << 20,
    long MaxTotalBytes = 8L << 30,
    int MaxHeaderBytes = 16 << 10,
    int MaxJsonBytes = 64 << 20)
{
    public static readonly DicomWebLimits Default = new(ZipLimits.Default.MaxEntries, ZipLimits.Default.MaxEntryBytes, ZipLimits.Default.MaxTotalBytes);
}
