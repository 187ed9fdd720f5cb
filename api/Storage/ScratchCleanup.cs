namespace Serimetry.Api.Storage;

/// <summary>
/// Removes what a crashed node left in <c>incoming/</c> (half-received uploads, unfinished study folders, result
/// folders of dead attempts). Every live writer names its own scratch entry uniquely and finishes within minutes, so
/// an entry untouched for <c>maxAge</c> belongs to no running request or job, also when several nodes share the folder.
/// </summary>
public static class ScratchCleanup
{
    /// <summary>Deletes entries of <c>incoming/</c> last written more than <paramref name="maxAge"/> ago; returns how many.</summary>
    public static int RemoveStale(DataPaths paths, TimeSpan maxAge)
    {
        var cutoff = DateTime.UtcNow - maxAge;
        int removed = 0;
        foreach (var entry in new DirectoryInfo(paths.Incoming).EnumerateFileSystemInfos())
        {
            if (entry.LastWriteTimeUtc > cutoff) continue;
            try
            {
                if (entry is DirectoryInfo d) d.Delete(recursive: true);
                else entry.Delete();
                removed++;
            }
            // Another node may be removing the same entry at the same moment.
            catch (IOException) { }
            catch (UnauthorizedAccessException) { }
        }
        return removed;
    }
}
