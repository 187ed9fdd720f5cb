using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Turns slice headers into studies → series → stacks, with roles, b-values, geometry and warnings.
/// Pure logic over <see cref="SliceHeader"/> records: no file access.
/// </summary>
public static class SeriesAssembler
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// Groups by Study then Series Instance UID; output order is deterministic: studies by Study Date then UID,
    /// series by Series Number then UID.
    /// </summary>
    public static IReadOnlyList<AssembledStudy> Assemble(IReadOnlyList<SliceHeader> slices, SeriesAssemblyOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(slices);
        options ??= new SeriesAssemblyOptions();
        var tol = options.Tolerances ?? StackTolerances.Default;
        var studies = new List<AssembledStudy>();
        var byStudy = slices.GroupBy(s => s.StudyInstanceUid ?? "")
            .OrderBy(g => g.First().StudyDate ?? "99999999", StringComparer.Ordinal).ThenBy(g => g.Key, StringComparer.Ordinal);
        foreach (var study in byStudy)
        {
            var list = study.ToList();
            var series = list.GroupBy(s => s.SeriesInstanceUid ?? PlaceholderUid(s))
                .Select(g => AssembleSeries(g.Key, g.ToList(), options, tol))
                .OrderBy(s => s.SeriesNumber ?? int.MaxValue).ThenBy(s => s.SeriesInstanceUid, StringComparer.Ordinal)
                .ToList();
            var warnings = new List<string>();
            if (list.Select(s => s.PatientId ?? "").Distinct().Count() > 1)
                warnings.Add("the study's images carry different Patient IDs; it will not be compared until that is resolved");
            if (study.Key.Length == 0) warnings.Add("images without Study Instance UID (0020,000D) were grouped together");
            var first = list[0];
            studies.Add(new AssembledStudy(study.Key.Length == 0 ? null : study.Key, first.PatientId, first.StudyDate, series, warnings));
        }
        return studies;
    }

    private static string PlaceholderUid(SliceHeader s) =>
        "(no Series Instance UID) " + (s.Source.Entry is { } e ? Path.GetDirectoryName(e) : Path.GetDirectoryName(s.Source.Container));

    internal static AssembledSeries AssembleSeries(string uid, IReadOnlyList<SliceHeader> all, SeriesAssemblyOptions options,
        StackTolerances tol)
    {
        var slices = WithoutCopies(all, out int copies);
        var stacks = StackGrouper.Group(slices, tol, out int orientationCount);
        var decision = RoleRules.Classify(slices);
        bool overridden = false;
        if (options.RoleOverrides is { } map && map.TryGetValue(uid, out var forced))
        {
            decision = new RoleDecision(forced, "assigned by the user", decision.IsComputed);
            overridden = true;
        }
        var main = MainStacks(stacks);
        var warnings = SeriesWarnings(slices, stacks, main, orientationCount, decision.Role);
        if (copies > 0)
            warnings.Insert(0, $"{copies} file(s) repeat an image already read (same SOP Instance UID and frame) and were ignored");
        var summary = Summarise(uid, slices, main, decision.Role, warnings, options.RootPath);
        int files = slices.Select(s => (s.Source.Container, s.Source.Entry)).Distinct().Count();
        return new AssembledSeries(uid, slices[0].SeriesNumber, decision, overridden, stacks, summary, files) { MainStacks = main };
    }

    /// <summary>
    /// Drops second copies of the same image (same SOP Instance UID and frame), e.g. a folder that holds both
    /// the files and a zip of them; the first in path order is kept.
    /// </summary>
    private static List<SliceHeader> WithoutCopies(IReadOnlyList<SliceHeader> slices, out int copies)
    {
        var seen = new HashSet<(string, int)>();
        var kept = new List<SliceHeader>(slices.Count);
        copies = 0;
        foreach (var s in slices)
        {
            if (s.SopInstanceUid is { } uid && !seen.Add((uid, s.Source.Frame)))
            {
                copies++;
                continue;
            }
            kept.Add(s);
        }
        return kept;
    }

    /// <summary>The stacks in the orientation holding the most slices, ordered by b-value.</summary>
    private static List<SliceStack> MainStacks(List<SliceStack> stacks)
    {
        var byOrientation = stacks.GroupBy(s => OrientationKey(s)).ToList();
        var best = byOrientation.OrderByDescending(g => g.Sum(s => s.Slices.Count)).First();
        return best.OrderBy(s => s.BValue ?? -1).ToList();
    }

    private static string OrientationKey(SliceStack s)
    {
        var f = s.Slices[0];
        return f.RowCosine is { } r && f.ColumnCosine is { } c
            ? string.Format(Inv, "{0:F3},{1:F3},{2:F3},{3:F3},{4:F3},{5:F3}", r.X, r.Y, r.Z, c.X, c.Y, c.Z) : "none";
    }

    private static List<string> SeriesWarnings(IReadOnlyList<SliceHeader> slices, List<SliceStack> stacks, List<SliceStack> main,
        int orientationCount, SeriesRole role)
    {
        var w = new List<string>();
        if (orientationCount > 1)
            w.Add(string.Format(Inv, "mixed orientations: {0} slice orientations in one series (stacks of {1} slices); the summary shows the largest",
                orientationCount, string.Join(", ", stacks.Select(s => s.Slices.Count))));
        var grids = main.Select(s => s.Slices[0]).Select(f => (f.Rows, f.Columns, f.RowSpacingMm, f.ColumnSpacingMm)).Distinct().Count();
        if (grids > 1)
            w.Add($"inconsistent Rows/Columns/Pixel Spacing within one orientation: {grids} different grids");
        foreach (var s in stacks)
            foreach (var m in s.Warnings) w.Add(stacks.Count > 1 ? $"stack [{s.Label}]: {m}" : m);
        if (role == SeriesRole.Dwi)
        {
            int unknown = slices.Count(s => BValueRules.Find(s).BValue is null);
            if (unknown > 0) w.Add($"b-value unknown for {unknown} of {slices.Count} images (no standard or recognised vendor b-value)");
            var g0 = main[0].Geometry;
            if (g0 is not null && main.Any(s => s.Geometry is { } g && !g.IsCongruentWith(g0, 0.01)))
                w.Add("the b-value stacks of this series do not share one voxel grid");
        }
        return w;
    }

    private static SeriesSummary Summarise(string uid, IReadOnlyList<SliceHeader> slices, List<SliceStack> main, SeriesRole role,
        List<string> warnings, string? root)
    {
        var stack = main[0];
        var f = stack.Slices[0];
        var g = stack.Geometry;
        var size = g?.Size ?? new Size3(f.Columns, f.Rows, stack.Slices.Count);
        var spacing = g?.SpacingMm ?? new Vec3(f.ColumnSpacingMm ?? double.NaN, f.RowSpacingMm ?? double.NaN, double.NaN);
        var origin = g?.OriginMm ?? new Vec3(double.NaN, double.NaN, double.NaN);
        var dir = g?.Direction ?? Mat3.Identity;
        IReadOnlyList<double> bValues = role == SeriesRole.Dwi
            ? main.Where(s => s.BValue is not null).Select(s => s.BValue!.Value).Distinct().Order().ToList() : [];
        var acq = new AcquisitionInfo(f.MagneticFieldStrengthT, f.Manufacturer, f.Model, f.RepetitionTimeMs, f.EchoTimeMs,
            f.SliceThicknessMm, f.SeriesDescription, f.Modality);
        return new SeriesSummary(uid, role, size, spacing, origin, dir, bValues, acq, RelativeSource(slices[0], root), warnings);
    }

    /// <summary>The folder of the series, relative to the inspected root (zip entries as archive!folder).</summary>
    internal static string RelativeSource(SliceHeader s, string? root)
    {
        string Rel(string p) => root is null ? p : Path.GetRelativePath(root, p);
        if (s.Source.Entry is { } e)
        {
            var dir = Path.GetDirectoryName(e.Replace('\\', '/')) ?? "";
            var zip = root is not null && string.Equals(Path.GetFullPath(root), Path.GetFullPath(s.Source.Container), StringComparison.Ordinal)
                ? Path.GetFileName(s.Source.Container) : Rel(s.Source.Container);
            return dir.Length == 0 ? zip : $"{zip}!{dir}";
        }
        var folder = Path.GetDirectoryName(s.Source.Container) ?? s.Source.Container;
        if (root is not null && File.Exists(root)) return Path.GetFileName(s.Source.Container);
        return Rel(folder);
    }
}
