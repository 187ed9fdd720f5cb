using Serimetry.Engine.Io;

namespace Serimetry.Engine.Io.Series;

/// <summary>Options of <see cref="SeriesAssembler"/>.</summary>
/// <param name="RoleOverrides">User-assigned roles by Series Instance UID; they replace the rules' choice.</param>
/// <param name="Tolerances">Grouping and spacing tolerances; <see cref="StackTolerances.Default"/> when null.</param>
/// <param name="RootPath">Paths in summaries are shown relative to this folder (or archive).</param>
public sealed record SeriesAssemblyOptions(
    IReadOnlyDictionary<string, SeriesRole>? RoleOverrides = null,
    StackTolerances? Tolerances = null,
    string? RootPath = null);

/// <summary>One series with its stacks and the summary that <c>inspect</c> prints.</summary>
/// <param name="SeriesInstanceUid">Series Instance UID (or a placeholder naming the folder when absent).</param>
/// <param name="SeriesNumber">Series Number (0020,0011).</param>
/// <param name="Role">The role and the rule (or override) that set it.</param>
/// <param name="RoleOverridden">True when the user assigned the role.</param>
/// <param name="Stacks">The series' stacks: one per orientation, b-value, image type and grid.</param>
/// <param name="Summary">The summary of the main stack (for DWI: the geometry of the lowest-b stack and every b-value).</param>
/// <param name="NumberOfFiles">Files (or zip entries) the series came from.</param>
public sealed record AssembledSeries(
    string SeriesInstanceUid,
    int? SeriesNumber,
    RoleDecision Role,
    bool RoleOverridden,
    IReadOnlyList<SliceStack> Stacks,
    SeriesSummary Summary,
    int NumberOfFiles)
{
    /// <summary>The stacks of the main orientation, lowest b-value first (what a volume is built from).</summary>
    public IReadOnlyList<SliceStack> MainStacks { get; init; } = [];

    /// <summary>The main stack of a given b-value (or the only main stack for non-diffusion series).</summary>
    public SliceStack? StackFor(double? bValue = null) =>
        bValue is null ? MainStacks.FirstOrDefault()
            : MainStacks.FirstOrDefault(s => s.BValue is { } b && Math.Abs(b - bValue.Value) < 0.5);
}

/// <summary>One study (exam): its identifiers and series.</summary>
public sealed record AssembledStudy(
    string? StudyInstanceUid,
    string? PatientId,
    string? StudyDate,
    IReadOnlyList<AssembledSeries> Series,
    IReadOnlyList<string> Warnings)
{
    /// <summary>The summary model shared with other readers.</summary>
    public StudySummary ToSummary() => new(StudyInstanceUid, PatientId, StudyDate, Series.Select(s => s.Summary).ToList());
}
