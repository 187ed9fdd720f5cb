using System.Reflection;

namespace Serimetry.Engine;

/// <summary>Name, version and the caution every human-facing output carries.</summary>
public static class SoftwareInfo
{
    public const string Name = "Serimetry";

    public static string Version { get; } =
        typeof(SoftwareInfo).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0]
        ?? "0.0.0";

    /// <summary>The caution printed on the CLI, in reports and in API responses.</summary>
    public const string Caution =
        "Caution: research and decision-support use only, not a diagnosis. Results depend on image quality, " +
        "protocol, segmentation and registration; validate locally. The reader's judgement, licensed practice " +
        "and local regulations come first.";
}
