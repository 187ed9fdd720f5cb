using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Change;

/// <summary>How much a difference threatens comparability.</summary>
public enum Severity
{
    Info,
    Warning,
    Critical,
}

/// <summary>Acquisition facts of one visit that the comparability check compares.</summary>
/// <param name="VisitIndex">Visit index.</param>
/// <param name="T2w">T2w acquisition parameters, or null.</param>
/// <param name="Diffusion">DWI/ADC acquisition parameters, or null.</param>
/// <param name="BValues">b-values (s/mm²) used for the ADC map, ascending; empty when unknown.</param>
/// <param name="T2wSpacingMm">T2w voxel spacing, or null.</param>
/// <param name="AdcSpacingMm">ADC voxel spacing, or null.</param>
/// <param name="AdcSource">Scanner or computed ADC, or null.</param>
public sealed record VisitAcquisition(
    int VisitIndex,
    AcquisitionInfo? T2w,
    AcquisitionInfo? Diffusion,
    IReadOnlyList<double> BValues,
    Vec3? T2wSpacingMm,
    Vec3? AdcSpacingMm,
    AdcSource? AdcSource)
{
    /// <summary>
    /// The comparability facts of a visit from its series summaries: acquisition parameters of the T2w and
    /// of the diffusion series (DWI when given, else ADC), b-values from the DWI series (else the ADC
    /// series' own list), and voxel spacings.
    /// </summary>
    public static VisitAcquisition FromSeries(int visitIndex, SeriesSummary? t2w, SeriesSummary? adc, SeriesSummary? dwi, AdcSource? source)
    {
        var diffusion = dwi ?? adc;
        IReadOnlyList<double> b = dwi is { BValues.Count: > 0 } ? dwi.BValues : adc?.BValues ?? [];
        return new VisitAcquisition(visitIndex, t2w?.Acquisition, diffusion?.Acquisition, b.Order().ToList(),
            t2w?.SpacingMm, adc?.SpacingMm, source);
    }
}

/// <summary>One finding of the comparability check (change.json <c>comparability[]</c>).</summary>
public sealed record ComparabilityItem(int FromVisit, int ToVisit, string Item, string? Baseline, string? Followup, Severity Severity, string Message);
