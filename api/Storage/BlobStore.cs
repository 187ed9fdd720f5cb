using System.Security.Cryptography;

namespace Serimetry.Api.Storage;

/// <summary>Content-addressed file store: each file lives once at <c>blobs/&lt;sha256[0..2]&gt;/&lt;sha256&gt;</c>.</summary>
public sealed class BlobStore(DataPaths paths)
{
    /// <summary>
    /// Stores <paramref name="data"/> (no-op when present) and returns its lowercase SHA-256 (FIPS 180-4). Safe when
    /// several nodes store the same file at once: each writes its own scratch file and renames it into place, and
    /// every rename puts the same bytes under the same name.
    /// </summary>
    public string Put(byte[] data)
    {
        string hash = Convert.ToHexStringLower(SHA256.HashData(data));
        string path = PathOf(hash);
        if (File.Exists(path)) return hash;
        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
        string tmp = Path.Combine(paths.Incoming, "blob-" + Guid.NewGuid().ToString("N"));
        try
        {
            File.WriteAllBytes(tmp, data);
            File.Move(tmp, path, overwrite: true);
        }
        finally { File.Delete(tmp); }
        return hash;
    }

    /// <summary>Where the blob with that hash lives.</summary>
    public string PathOf(string hash) => Path.Combine(paths.Blobs, hash[..2], hash);
}
