namespace Serimetry.Tests.Shared;

/// <summary>A temporary folder for one test, removed afterwards (best effort: a leftover temp folder is harmless).</summary>
public sealed class ScratchFolder : IDisposable
{
    public ScratchFolder(string prefix = "serimetry-")
    {
        Dir = Directory.CreateTempSubdirectory(prefix).FullName;
    }

    public string Dir { get; }

    public string PathOf(string name) => Path.Combine(Dir, name);

    public void Dispose()
    {
        try
        {
            Directory.Delete(Dir, recursive: true);
        }
        catch (IOException)
        {
            // A file still open by a child process; the OS temp cleaner removes the folder later.
        }
    }
}
