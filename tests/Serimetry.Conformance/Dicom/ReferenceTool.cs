using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Dicom;

/// <summary>Runs an outside reference tool (dcmtk, GDCM) and fails clearly when it is missing or fails.</summary>
internal static class ReferenceTool
{
    public static void Run(string tool, params string[] args) => Capture(tool, args);

    /// <summary>Runs the tool and returns its standard output.</summary>
    public static string Capture(string tool, params string[] args) => ToolProcess.Checked(tool, "dcmtk and libgdcm-tools", args).Stdout;

    /// <summary>A fresh temporary folder, deleted by <see cref="IDisposable.Dispose"/>.</summary>
    public sealed class TempDir : IDisposable
    {
        public string Path { get; } = Directory.CreateTempSubdirectory("serimetry-dicom-").FullName;

        public string File(string name) => System.IO.Path.Combine(Path, name);

        public void Dispose() => Directory.Delete(Path, true);
    }
}
