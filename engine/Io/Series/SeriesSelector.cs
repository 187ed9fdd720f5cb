using System.Globalization;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Io.Series;

/// <summary>The series chosen for a role, why, and what the user should know.</summary>
/// <param name="Series">The chosen series, or null when the study has none usable for the role.</param>
/// <param name="Reason">How it was chosen.</param>
/// <param name="Warnings">E.g. several candidates, or candidates without a regular stack.</param>
public sealed record SeriesChoice(AssembledSeries? Series, string Reason, IReadOnlyList<string> Warnings);

/// <summary>
/// Picks the series that later steps use for a role (T2w for registration, ADC for ADC measures, DWI at a
/// b-value). Rules (common practice, see docs/series.md): only series whose stack for the request is regular;
/// for DWI, acquired before scanner-computed; then the highest Series Number (a sequence repeated in one
/// session is usually repeated because the first run was degraded). User role overrides are applied before.
/// </summary>
public static class SeriesSelector
{
    public static SeriesChoice Select(AssembledStudy study, SeriesRole role, double? bValue = null)
    {
        ArgumentNullException.ThrowIfNull(study);
        var warnings = new List<string>();
        var candidates = study.Series.Where(s => s.Summary.Role == role).ToList();
        if (candidates.Count == 0)
            return new SeriesChoice(null, $"no {Name(role)} series in the study", warnings);
        var usable = candidates.Where(s => s.StackFor(bValue) is { IsRegular: true }).ToList();
        foreach (var s in candidates.Except(usable))
            warnings.Add($"series {s.SeriesNumber?.ToString(CultureInfo.InvariantCulture) ?? s.SeriesInstanceUid} is {Name(role)} but has no regular stack"
                + (bValue is { } b ? string.Create(CultureInfo.InvariantCulture, $" at b={b}") : ""));
        if (usable.Count == 0)
            return new SeriesChoice(null, $"no {Name(role)} series with a regular stack", warnings);
        var ordered = usable
            .OrderBy(s => s.Role.IsComputed ? 1 : 0)
            .ThenByDescending(s => s.SeriesNumber ?? int.MinValue)
            .ThenBy(s => s.SeriesInstanceUid, StringComparer.Ordinal)
            .ToList();
        var chosen = ordered[0];
        var label = chosen.SeriesNumber?.ToString(CultureInfo.InvariantCulture) ?? chosen.SeriesInstanceUid;
        string reason = usable.Count == 1
            ? $"the only {Name(role)} series (series {label})"
            : $"series {label}: {(chosen.Role.IsComputed ? "computed" : "acquired")}, highest Series Number of {usable.Count} candidates";
        if (usable.Count > 1)
            warnings.Add($"{usable.Count} {Name(role)} series; chose series {label}; assign roles to choose another");
        return new SeriesChoice(chosen, reason, warnings);
    }

    private static string Name(SeriesRole role) => InspectReport.RoleName(role);
}
