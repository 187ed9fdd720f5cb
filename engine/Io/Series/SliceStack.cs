using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Tolerances used when grouping slices and checking a stack. Recorded so results can be reproduced.
/// All are common practice (no standard prescribes them); see docs/series.md.
/// </summary>
/// <param name="OrientationCosine">Two orientations are the same when every direction cosine differs by at most this (≈0.06°).</param>
/// <param name="DuplicateMm">Two slices closer than this along the normal share a position.</param>
/// <param name="SpacingRelative">A slice step may differ from the stack's median step by this fraction …</param>
/// <param name="SpacingAbsoluteMm">… or by this many mm, whichever is larger, and still count as uniform.</param>
/// <param name="InPlaneDriftMm">Slice positions may leave the line along the normal by at most this (else the stack is sheared).</param>
public sealed record StackTolerances(
    double OrientationCosine = 1e-3,
    double DuplicateMm = 0.01,
    double SpacingRelative = 0.01,
    double SpacingAbsoluteMm = 0.01,
    double InPlaneDriftMm = 0.05)
{
    public static readonly StackTolerances Default = new();

    /// <summary>The step tolerance for a nominal step (mm).</summary>
    public double StepTolerance(double stepMm) => Math.Max(SpacingAbsoluteMm, SpacingRelative * Math.Abs(stepMm));
}

/// <summary>
/// One regular set of slices of a series: same orientation, grid, b-value (for DWI) and image type,
/// ordered along the slice normal n = row cosine × column cosine (PS3.3 C.7.6.2.1.1), never by
/// Instance Number.
/// </summary>
/// <param name="Slices">Slices in increasing position along n.</param>
/// <param name="Geometry">The voxel grid: origin = position of the first slice, direction columns (row cosine,
/// column cosine, n), spacing (column spacing, row spacing, slice step from positions). Null when the
/// slices lack position or orientation.</param>
/// <param name="BValue">b-value in s/mm² for diffusion stacks, else null.</param>
/// <param name="BValueSource">Where the b-value came from.</param>
/// <param name="Label">Short description of what sets this stack apart within its series.</param>
/// <param name="Warnings">What is unusual (gaps, non-uniform spacing, duplicates …).</param>
/// <param name="BlockingProblem">Why no regular volume can be built from it, or null when it can.</param>
public sealed record SliceStack(
    IReadOnlyList<SliceHeader> Slices,
    Geometry? Geometry,
    double? BValue,
    string BValueSource,
    string Label,
    IReadOnlyList<string> Warnings,
    string? BlockingProblem)
{
    /// <summary>True when a volume can be built (uniform spacing, no gap, no duplicate position).</summary>
    public bool IsRegular => BlockingProblem is null && Geometry is not null;
}
