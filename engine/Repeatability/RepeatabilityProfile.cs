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
    string Source);

/// <summary>A set of repeatability entries; the change engine looks measures up by id.</summary>
/// <param name="Name">Profile name.</param>
/// <param name="Entries">Entries, one per measure id.</param>
public sealed record RepeatabilityProfile(string Name, IReadOnlyList<RepeatabilityEntry> Entries)
{
    /// <summary>The entry for a measure id, or null when the profile has none.</summary>
    public RepeatabilityEntry? Find(string measure) => Entries.FirstOrDefault(e => e.Measure == measure);
}
