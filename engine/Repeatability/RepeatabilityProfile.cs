using Serimetry.Engine.Core;

namespace Serimetry.Engine.Repeatability;

/// <summary>How a measure's measurement error behaves, which decides how its change band is built.</summary>
public enum ErrorScale
{
    /// <summary>Error independent of level: bands from wSD on the measured scale (delta ± RC).</summary>
    Absolute,

    /// <summary>Error proportional to level: bands from wCV on the log scale (ratio × exp(±1.96·√2·σL)).</summary>
    Log,
}

/// <summary>
/// Repeatability of one measure (Src: Bland, "repeatability" note; RC = 1.96·√2·wSD ≈ 2.77·wSD, see
/// shared/reference/facts.md §1). For <see cref="ErrorScale.Log"/> entries <see cref="WithinSubjectCv"/>
/// is used; for <see cref="ErrorScale.Absolute"/> entries <see cref="WithinSubjectSd"/>.
/// </summary>
/// <param name="Measure">Dotted measure id, e.g. <c>lesion.adc.median</c>.</param>
/// <param name="Scale">Absolute or log error model.</param>
/// <param name="WithinSubjectSd">wSD in the measure's unit (absolute scale), else null.</param>
/// <param name="WithinSubjectCv">wCV as a fraction (log scale), else null.</param>
/// <param name="Unit">Unit of wSD.</param>
/// <param name="Source">"site QA run YYYY-MM-DD" or a published source with citation.</param>
public sealed record RepeatabilityEntry(
    string Measure,
    ErrorScale Scale,
    double? WithinSubjectSd,
    double? WithinSubjectCv,
    string Unit,
    string Source)
{
    /// <summary>
    /// σL, the SD of ln(value) under repeat conditions, from wCV with the lognormal relation
    /// σL = √ln(1 + wCV²) (inverse of wCV = √(exp(σL²) − 1)); null when wCV is absent.
    /// </summary>
    public double? SdLog => WithinSubjectCv is double c ? Math.Sqrt(Math.Log(1 + c * c)) : null;

    /// <summary>RC = 1.96·√2·wSD in the measure's unit (absolute scale), else null.</summary>
    public double? RepeatabilityCoefficient => WithinSubjectSd is double s ? TestRetestAnalysis.RcFactor * s : null;
}

/// <summary>A set of repeatability entries; the change engine looks measures up by id.</summary>
/// <param name="Name">Profile name.</param>
/// <param name="Entries">Entries, one per measure id.</param>
public sealed record RepeatabilityProfile(string Name, IReadOnlyList<RepeatabilityEntry> Entries)
{
    /// <summary>The entry for a measure id, or null when the profile has none.</summary>
    public RepeatabilityEntry? Find(string measure) => Entries.FirstOrDefault(e => e.Measure == measure);

    /// <summary>
    /// Loads a profile file: the shipped default format or the output of <c>serimetry qa test-retest</c>
    /// (schema in docs/qa.md). Throws <see cref="InputFormatException"/> on malformed content.
    /// </summary>
    public static RepeatabilityProfile Load(string path)
    {
        if (!File.Exists(path))
            throw new InputFormatException("repeatability profile not found", path, "give a profile JSON file, or omit the option to use the published defaults");
        return Parse(File.ReadAllText(path), Path.GetFileName(path));
    }

    /// <summary>Parses profile JSON text; <paramref name="where"/> names the source in errors.</summary>
    public static RepeatabilityProfile Parse(string json, string where) =>
        RepeatabilityProfileJson.Parse(json, where, Path.GetFileNameWithoutExtension(where));

    /// <summary>
    /// The published default profile shipped inside the engine (phantoms/repeatability-default.json,
    /// embedded so it does not depend on the working directory). Each entry cites its source.
    /// </summary>
    public static RepeatabilityProfile LoadDefault()
    {
        using var stream = typeof(RepeatabilityProfile).Assembly.GetManifestResourceStream(RepeatabilityProfileJson.DefaultResourceName)
            ?? throw new InvalidOperationException("The default repeatability profile resource is missing from the engine assembly.");
        using var reader = new StreamReader(stream);
        return RepeatabilityProfileJson.Parse(reader.ReadToEnd(), "repeatability-default.json", "published defaults");
    }
}
