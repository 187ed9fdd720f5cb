using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Codecs;

/// <summary>Runs a reference tool (dcmtk, GDCM, pvrg-jpeg) and fails the test with its output when it fails.</summary>
internal static class ExternalTool
{
    public static void Run(string exe, params string[] args) =>
        ToolProcess.Checked(exe, "dcmtk, libgdcm-tools and pvrg-jpeg", args);

    /// <summary>A fresh scratch folder under the system temp folder; delete it with <see cref="Directory.Delete(string, bool)"/>.</summary>
    public static string ScratchFolder()
    {
        var dir = Path.Combine(Path.GetTempPath(), "serimetry-codecs-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        return dir;
    }
}
