namespace Serimetry.Api.Storage;

/// <summary>Where the service keeps its files inside the data folder.</summary>
public sealed class DataPaths
{
    /// <summary>Creates the folders under <paramref name="root"/> when missing.</summary>
    public DataPaths(string root)
    {
        Root = Path.GetFullPath(root);
        foreach (var d in new[] { Root, Blobs, Studies, Masks, Comparisons, Incoming }) Directory.CreateDirectory(d);
    }

    /// <summary>The data folder.</summary>
    public string Root { get; }

    /// <summary>Metadata database (studies, masks, comparisons, keys, audit).</summary>
    public string MetadataDb => Path.Combine(Root, "serimetry.db");

    /// <summary>Job queue database (Hangfire storage).</summary>
    public string JobsDb => Path.Combine(Root, "jobs.db");

    /// <summary>Content-addressed uploaded files (sha256).</summary>
    public string Blobs => Path.Combine(Root, "blobs");

    /// <summary>Study folders as the engine reads them.</summary>
    public string Studies => Path.Combine(Root, "studies");

    /// <summary>Mask files.</summary>
    public string Masks => Path.Combine(Root, "masks");

    /// <summary>Finished comparison outputs, one folder each.</summary>
    public string Comparisons => Path.Combine(Root, "comparisons");

    /// <summary>Scratch space for uploads and unfinished outputs (same volume, so renames are atomic).</summary>
    public string Incoming => Path.Combine(Root, "incoming");
}
