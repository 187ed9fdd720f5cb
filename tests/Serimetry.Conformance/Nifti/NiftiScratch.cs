namespace Serimetry.Conformance.Nifti;

/// <summary>A temporary folder removed after the test.</summary>
internal sealed class NiftiScratch : IDisposable
{
    public NiftiScratch()
    {
        Dir = Path.Combine(Path.GetTempPath(), "serimetry-nifti-conf-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Dir);
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
            // best effort
        }
    }
}
