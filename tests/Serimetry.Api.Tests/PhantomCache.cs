using System.Security.Cryptography;
using System.Text;
using Serimetry.Engine.Phantoms;

namespace Serimetry.Api.Tests;

/// <summary>
/// Phantom folders made once per build output: kept beside the test assembly and named by the spec's hash (same spec,
/// same voxels: fixed seed). A folder is written under a temporary name and moved into place, so parallel test
/// processes never see half of one.
/// </summary>
internal static class PhantomCache
{
    /// <summary>Two visits of the small digital phantom (known truth: PhantomGenerator) for the service tests.</summary>
    public static PhantomSpec TwoVisits(string subjectId, int seed) => new PhantomSpec() with
    {
        SubjectId = subjectId, Visits = 2, Seed = seed,
        T2Grid = new PhantomGrid(100, 80, 14, 1.0, 1.0, 3.0),
        DwiGrid = new PhantomGrid(50, 40, 14, 2.0, 2.0, 3.0),
    };

    /// <summary>
    /// The folder <paramref name="prefix"/>-hash; when <paramref name="lastFile"/> (the last file
    /// <paramref name="write"/> makes) is missing, <paramref name="write"/> fills a fresh folder first.
    /// </summary>
    public static string Folder(string prefix, PhantomSpec spec, string lastFile, Action<string> write)
    {
        string hash = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(spec.ToJson())))[..12];
        string dir = Path.Combine(AppContext.BaseDirectory, prefix + "-" + hash);
        if (File.Exists(Path.Combine(dir, lastFile))) return dir;
        string tmp = dir + "-" + Guid.NewGuid().ToString("N")[..8];
        write(tmp);
        try { Directory.Move(tmp, dir); }
        catch (IOException) when (Directory.Exists(dir)) { Directory.Delete(tmp, recursive: true); }
        return dir;
    }
}
