using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Orders one group of slices along the slice normal, derives the slice step from positions and
/// checks the stack: duplicates, gaps, non-uniform spacing, in-plane drift (PS3.3 C.7.6.2.1.1).
/// </summary>
internal static class StackGeometry
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static SliceStack Evaluate(IReadOnlyList<SliceHeader> group, string label, double? bValue, string bSource,
        StackTolerances tol)
    {
        var first = group[0];
        if (first.ImagePositionPatient is null || first.RowCosine is null || first.ColumnCosine is null
            || group.Any(s => s.ImagePositionPatient is null))
        {
            const string why = "slices lack Image Position/Orientation (Patient) (0020,0032)/(0020,0037), so they cannot be placed";
            return new SliceStack(group, null, bValue, bSource, label, [why], why);
        }
        var r = first.RowCosine.Value;
        var c = first.ColumnCosine.Value;
        var cross = r.Cross(c);
        if (!(cross.Norm > 0.5) || Math.Abs(r.Norm - 1) > 0.01 || Math.Abs(c.Norm - 1) > 0.01)
        {
            var why = $"Image Orientation (Patient) (0020,0037) row {r} and column {c} are not two perpendicular unit vectors";
            return new SliceStack(group, null, bValue, bSource, label, [why], why);
        }
        var n = cross.Normalized();
        var ordered = Order(group, n);
        var positions = ordered.Select(s => s.ImagePositionPatient!.Value.Dot(n)).ToArray();
        var warnings = new List<string>();
        string? blocking = null;

        int duplicates = CountDuplicates(positions, tol.DuplicateMm);
        if (duplicates > 0)
            blocking = Add(warnings, string.Format(Inv,
                "{0} slice(s) share a position along the normal with another slice (duplicate positions, tolerance {1} mm); " +
                "the series may hold repeated acquisitions that no attribute separates", duplicates, tol.DuplicateMm));
        var unique = UniquePositions(positions, tol.DuplicateMm);
        double step = SliceStep(unique, first, warnings);
        if (unique.Length > 2)
        {
            if (CheckSpacing(unique, step, tol) is { } spacingProblem) blocking = Block(blocking, warnings, spacingProblem);
        }
        double drift = InPlaneDrift(ordered, n);
        if (drift > tol.InPlaneDriftMm)
            blocking = Block(blocking, warnings, string.Format(Inv,
                "slice positions leave the line along the slice normal by up to {0:G4} mm (sheared stack, tolerance {1} mm)",
                drift, tol.InPlaneDriftMm));

        var geometry = MakeGeometry(ordered[0], unique, first, r, c, n, step, warnings);
        if (geometry is null) blocking ??= warnings[^1];
        return new SliceStack(ordered, geometry, bValue, bSource, label, warnings, blocking);
    }

    private static string Add(List<string> warnings, string message)
    {
        warnings.Add(message);
        return message;
    }

    /// <summary>Records a problem as a warning; the first problem found stays the blocking one.</summary>
    private static string Block(string? blocking, List<string> warnings, string message)
    {
        warnings.Add(message);
        return blocking ?? message;
    }

    /// <summary>Sorts by position along n; ties by Instance Number then source, so the order is deterministic.</summary>
    internal static List<SliceHeader> Order(IReadOnlyList<SliceHeader> group, Vec3 n) =>
        group.OrderBy(s => s.ImagePositionPatient!.Value.Dot(n))
            .ThenBy(s => s.InstanceNumber ?? int.MaxValue)
            .ThenBy(s => s.Source.Container, StringComparer.Ordinal)
            .ThenBy(s => s.Source.Entry ?? "", StringComparer.Ordinal)
            .ThenBy(s => s.Source.Frame)
            .ToList();

    private static int CountDuplicates(double[] sorted, double tolMm)
    {
        int d = 0;
        for (int i = 1; i < sorted.Length; i++)
            if (sorted[i] - sorted[i - 1] < tolMm) d++;
        return d;
    }

    private static double[] UniquePositions(double[] sorted, double tolMm)
    {
        var list = new List<double>(sorted.Length);
        foreach (var p in sorted)
            if (list.Count == 0 || p - list[^1] >= tolMm) list.Add(p);
        return list.ToArray();
    }

    /// <summary>The nominal step: mean step for regular stacks (computed later), median of steps otherwise.</summary>
    private static double SliceStep(double[] unique, SliceHeader first, List<string> warnings)
    {
        if (unique.Length >= 2)
        {
            var steps = new double[unique.Length - 1];
            for (int i = 0; i < steps.Length; i++) steps[i] = unique[i + 1] - unique[i];
            Array.Sort(steps);
            return steps[steps.Length / 2];
        }
        double fallback = first.SpacingBetweenSlicesMm ?? first.SliceThicknessMm ?? 1.0;
        if (!(fallback > 0)) fallback = 1.0;
        warnings.Add(string.Format(Inv,
            "single slice position: slice spacing {0:G6} mm taken from {1}", fallback,
            first.SpacingBetweenSlicesMm is > 0 ? "Spacing Between Slices (0018,0088)"
            : first.SliceThicknessMm is > 0 ? "Slice Thickness (0018,0050)" : "a default of 1 mm"));
        return fallback;
    }

    /// <summary>Finds gaps (a step that is a whole multiple of the nominal step) and other non-uniform steps.</summary>
    internal static string? CheckSpacing(double[] unique, double step, StackTolerances tol)
    {
        double t = tol.StepTolerance(step);
        var gaps = new List<string>();
        var odd = new List<string>();
        int missing = 0;
        for (int i = 0; i + 1 < unique.Length; i++)
        {
            double s = unique[i + 1] - unique[i];
            if (Math.Abs(s - step) <= t) continue;
            double m = Math.Round(s / step);
            if (m >= 2 && Math.Abs(s - m * step) <= t * m)
            {
                missing += (int)m - 1;
                gaps.Add(string.Format(Inv, "{0} missing between slice {1} and {2} (positions {3:F3} and {4:F3} mm along the normal)",
                    (int)m - 1, i + 1, i + 2, unique[i], unique[i + 1]));
            }
            else
            {
                odd.Add(string.Format(Inv, "step {0:G6} mm between slice {1} and {2}", s, i + 1, i + 2));
            }
        }
        if (gaps.Count > 0 && odd.Count == 0)
            return string.Format(Inv, "gap in the slice positions: {0} slice(s) missing (nominal step {1:G6} mm): {2}",
                missing, step, string.Join("; ", gaps.Take(5)));
        if (gaps.Count + odd.Count > 0)
            return string.Format(Inv, "non-uniform slice spacing (nominal step {0:G6} mm, tolerance {1:G3} mm): {2}",
                step, t, string.Join("; ", gaps.Concat(odd).Take(5)));
        return null;
    }

    /// <summary>Largest distance of a slice position from the line through the first position along n.</summary>
    private static double InPlaneDrift(List<SliceHeader> ordered, Vec3 n)
    {
        var p0 = ordered[0].ImagePositionPatient!.Value;
        double worst = 0;
        foreach (var s in ordered)
        {
            var d = s.ImagePositionPatient!.Value - p0;
            worst = Math.Max(worst, (d - d.Dot(n) * n).Norm);
        }
        return worst;
    }

    private static Geometry? MakeGeometry(SliceHeader lowest, double[] unique, SliceHeader first, Vec3 r, Vec3 c, Vec3 n,
        double nominalStep, List<string> warnings)
    {
        if (first.RowSpacingMm is not > 0 || first.ColumnSpacingMm is not > 0)
        {
            warnings.Add("Pixel Spacing (0028,0030) is missing or not positive");
            return null;
        }
        int positions = unique.Length;
        double step = nominalStep;
        if (positions > 1)
        {
            // The mean step over the whole stack is the least-noise estimate when the spacing is uniform.
            double mean = (unique[^1] - unique[0]) / (positions - 1);
            if (Math.Abs(mean - nominalStep) <= 1e-3 * nominalStep) step = mean;
        }
        try
        {
            return new Geometry(new Size3(first.Columns, first.Rows, positions),
                new Vec3(first.ColumnSpacingMm.Value, first.RowSpacingMm.Value, step),
                lowest.ImagePositionPatient!.Value, Mat3.FromColumns(r, c, n));
        }
        catch (InputException e)
        {
            warnings.Add("no valid geometry: " + e.Message);
            return null;
        }
    }
}
