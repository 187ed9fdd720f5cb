using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Splits the slices of one series into stacks: by orientation, then by b-value (diffusion), Image Type,
/// grid (rows, columns, pixel spacing) and diffusion gradient direction; and, when positions repeat,
/// by Acquisition Number and Echo Time.
/// </summary>
internal static class StackGrouper
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private readonly record struct Key(int Orientation, double? BValue, string ImageType, string Grid, string Gradient);

    /// <summary>The stacks of one series, ordered by orientation, then b-value, then first appearance.</summary>
    public static List<SliceStack> Group(IReadOnlyList<SliceHeader> slices, StackTolerances tol, out int orientationCount)
    {
        var orientations = new List<(Vec3 R, Vec3 C)>();
        var groups = new Dictionary<Key, List<SliceHeader>>();
        var order = new List<Key>();
        var bSources = new Dictionary<Key, string>();
        foreach (var s in slices)
        {
            var b = BValueRules.Find(s);
            var key = new Key(OrientationIndex(s, orientations, tol), b.BValue is { } v ? Math.Round(v, 1) : null,
                string.Join('\\', s.ImageType), GridKey(s), GradientKey(s));
            if (!groups.TryGetValue(key, out var list))
            {
                groups[key] = list = [];
                order.Add(key);
                bSources[key] = b.Source;
            }
            list.Add(s);
        }
        orientationCount = Math.Max(1, orientations.Count);
        var sortedKeys = order.Select((k, i) => (k, i))
            .OrderBy(t => t.k.Orientation).ThenBy(t => t.k.BValue ?? -1).ThenBy(t => t.i).Select(t => t.k);
        bool severalTypes = order.Select(k => k.ImageType).Distinct().Count() > 1;
        var stacks = new List<SliceStack>();
        foreach (var key in sortedKeys)
            foreach (var (part, extra) in SplitRepeats(groups[key], tol))
                stacks.Add(StackGeometry.Evaluate(part, Label(key, extra, orientations.Count, severalTypes), key.BValue, bSources[key], tol));
        return stacks;
    }

    private static int OrientationIndex(SliceHeader s, List<(Vec3 R, Vec3 C)> known, StackTolerances tol)
    {
        if (s.RowCosine is not { } r || s.ColumnCosine is not { } c) return -1;
        for (int i = 0; i < known.Count; i++)
            if (MaxDiff(known[i].R, r) <= tol.OrientationCosine && MaxDiff(known[i].C, c) <= tol.OrientationCosine) return i;
        known.Add((r, c));
        return known.Count - 1;
    }

    private static double MaxDiff(Vec3 a, Vec3 b) =>
        Math.Max(Math.Abs(a.X - b.X), Math.Max(Math.Abs(a.Y - b.Y), Math.Abs(a.Z - b.Z)));

    private static string GridKey(SliceHeader s) => string.Format(Inv, "{0}x{1} {2:F4}x{3:F4}",
        s.Columns, s.Rows, s.ColumnSpacingMm ?? 0, s.RowSpacingMm ?? 0);

    private static string GradientKey(SliceHeader s) =>
        s.DiffusionGradient is { } g && string.Equals(s.DiffusionDirectionality, "DIRECTIONAL", StringComparison.OrdinalIgnoreCase)
            ? string.Format(Inv, "{0:F3},{1:F3},{2:F3}", g.X, g.Y, g.Z) : "";

    /// <summary>
    /// When positions repeat inside a group and Acquisition Number or Echo Time tell the repeats apart
    /// (repeated acquisitions, multi-echo), splits by them; otherwise keeps the group (and its duplicates).
    /// </summary>
    private static IEnumerable<(List<SliceHeader> Part, string Extra)> SplitRepeats(List<SliceHeader> group, StackTolerances tol)
    {
        if (!HasRepeatedPositions(group, tol))
        {
            yield return (group, "");
            yield break;
        }
        var parts = group.GroupBy(s => (s.AcquisitionNumber, s.EchoTimeMs)).ToList();
        if (parts.Count == 1)
        {
            yield return (group, "");
            yield break;
        }
        foreach (var p in parts)
            yield return (p.ToList(), string.Format(Inv, "acquisition {0}, TE {1} ms", p.Key.AcquisitionNumber, p.Key.EchoTimeMs));
    }

    private static bool HasRepeatedPositions(List<SliceHeader> group, StackTolerances tol)
    {
        if (group[0].Normal is not { } n || group.Any(s => s.ImagePositionPatient is null)) return false;
        var d = group.Select(s => s.ImagePositionPatient!.Value.Dot(n)).Order().ToArray();
        for (int i = 1; i < d.Length; i++)
            if (d[i] - d[i - 1] < tol.DuplicateMm) return true;
        return false;
    }

    private static string Label(Key key, string extra, int orientationCount, bool severalTypes)
    {
        var parts = new List<string>();
        if (orientationCount > 1) parts.Add($"orientation {key.Orientation + 1}");
        if (severalTypes) parts.Add($"Image Type {key.ImageType}");
        if (key.BValue is { } b) parts.Add(string.Format(Inv, "b={0:G6}", b));
        if (key.Gradient.Length > 0) parts.Add($"gradient {key.Gradient}");
        if (extra.Length > 0) parts.Add(extra);
        parts.Add(key.Grid + " mm");
        return string.Join(", ", parts);
    }
}
