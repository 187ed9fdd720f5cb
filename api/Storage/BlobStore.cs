using System.Security.Cryptography;

namespace Serimetry.Api.Storage;

/// <summary>Content-addressed file store: each file lives once at <c>blobs/&lt;sha256[0..2]&gt;/&lt;sha256&gt;</c>.</summary>
public sealed class BlobStore(DataPaths paths)
{
    /// <summary>
    /// Stores the file at <paramref name="source"/> (no-op when its content is present) and returns its lowercase
    /// SHA-256 (FIPS 180-4), read as a stream so a file of any size needs only a buffer. With <paramref name="move"/> the
    /// source (which must be on the data folder's volume) is renamed into place or deleted, instead of copied. Safe
    /// when several nodes store the same file at once: each renames its own file into place, and every rename puts
    /// the same bytes under the same name.
    /// </summary>
    public string Put(string source, bool move)
    {
        string hash;
        using (var s = new FileStream(source, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16, FileOptions.SequentialScan))
            hash = Convert.ToHexStringLower(SHA256.HashData(s));
        string path = PathOf(hash);
        if (File.Exists(path))
        {
            if (move) File.Delete(source);
            return hash;
        }
        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
        if (move)
        {
            File.Move(source, path, overwrite: true);
            return hash;
        }
        string tmp = Path.Combine(paths.Incoming, "blob-" + Guid.NewGuid().ToString("N"));
        try
        {
            File.Copy(source, tmp);
            File.Move(tmp, path, overwrite: true);
        }
        finally { File.Delete(tmp); }
        return hash;
    }

    /// <summary>Where the blob with that hash lives.</summary>
    public string PathOf(string hash) => Path.Combine(paths.Blobs, hash[..2], hash);
}
