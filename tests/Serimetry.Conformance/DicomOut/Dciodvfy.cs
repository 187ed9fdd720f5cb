using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.DicomOut;

/// <summary>
/// Runs dicom3tools' <c>dciodvfy</c> (an independent IOD validator) and splits its report into errors and
/// warnings; its exit code does not signal findings, so the lines are read.
/// </summary>
internal static class Dciodvfy
{
    public static (IReadOnlyList<string> Errors, IReadOnlyList<string> Warnings) Check(string path)
    {
        var (_, output, err) = ToolProcess.Run(ToolProcess.StartInfo("dciodvfy", [path]), TimeSpan.FromMinutes(2), "dicom3tools");
        var lines = (output + "\n" + err).Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        return (lines.Where(l => l.StartsWith("Error", StringComparison.Ordinal)).ToList(),
            lines.Where(l => l.StartsWith("Warning", StringComparison.Ordinal)).ToList());
    }
}
