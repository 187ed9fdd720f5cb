using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Io;

/// <summary>Options of <see cref="StudyIndex.Build"/>.</summary>
/// <param name="MaxFiles">Most files (and zip entries) one index may look at.</param>
/// <param name="Zip">Limits for .zip archives.</param>
/// <param name="MaxDegreeOfParallelism">Threads for reading headers (-1: all cores; 1: sequential). Output order never depends on it.</param>
/// <param name="Progress">Told (files done, files in total) now and then while headers are read; may be called from any thread.</param>
public sealed record StudyIndexOptions(int MaxFiles = 200_000, ZipLimits? Zip = null, int MaxDegreeOfParallelism = -1,
    IProgress<(int Done, int Total)>? Progress = null)
{
    public static readonly StudyIndexOptions Default = new();
}

/// <summary>A file the index skipped or could not read, and why (never contains patient identifiers).</summary>
/// <param name="Where">The file (or archive!entry).</param>
/// <param name="Reason">Why it gave no images.</param>
public sealed record StudyIndexNote(string Where, string Reason);
