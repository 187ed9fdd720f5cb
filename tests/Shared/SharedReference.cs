namespace Serimetry.Tests.Shared;

/// <summary>
/// Locates the outside reference data (<c>../shared/reference</c> beside the repository root) by
/// walking up from the test assembly's folder. Tests read it in place; nothing is copied into the repository.
/// </summary>
public static class SharedReference
{
    private static readonly Lazy<string> RootDir = new(Find);

    /// <summary>The <c>shared/reference</c> folder.</summary>
    public static string Root => RootDir.Value;

    public static string PathOf(params string[] parts) => Path.Combine([Root, .. parts]);

    /// <summary>The repository root (the folder holding Serimetry.sln).</summary>
    public static string RepoRoot
    {
        get
        {
            for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
                if (File.Exists(Path.Combine(d.FullName, "Serimetry.sln"))) return d.FullName;
            throw new DirectoryNotFoundException("repository root (Serimetry.sln) not found above " + AppContext.BaseDirectory);
        }
    }

    private static string Find()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var candidate = Path.Combine(d.FullName, "shared", "reference");
            if (Directory.Exists(candidate)) return candidate;
        }
        throw new DirectoryNotFoundException(
            "../shared/reference not found above " + AppContext.BaseDirectory + "; it must sit beside the repository root");
    }
}
