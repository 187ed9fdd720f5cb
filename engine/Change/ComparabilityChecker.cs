using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Change;

/// <summary>
/// Compares acquisition parameters of each follow-up with the baseline and with the previous visit and
/// lists what threatens comparability (thresholds in docs/change.md; they are common practice, not
/// published limits). Field strength changes ADC and T2w contrast (critical); vendor or b-value changes
/// shift ADC (warning); slice thickness and voxel size change partial-volume effects on volumes.
/// </summary>
public static class ComparabilityChecker
{
    /// <summary>Relative difference from which a size/time parameter is reported as info, warning and critical.</summary>
    internal const double InfoRel = 0.05, WarningRel = 0.20, CriticalRel = 0.50;

    /// <summary>All findings, ordered by pair then item.</summary>
    public static IReadOnlyList<ComparabilityItem> Check(IReadOnlyList<VisitAcquisition> visits)
    {
        var items = new List<ComparabilityItem>();
        var ordered = visits.OrderBy(v => v.VisitIndex).ToList();
        for (int i = 1; i < ordered.Count; i++)
        {
            items.AddRange(Pair(ordered[0], ordered[i]));
            if (i > 1) items.AddRange(Pair(ordered[i - 1], ordered[i]));
        }
        return items;
    }

    /// <summary>Findings for one pair of visits.</summary>
    public static IReadOnlyList<ComparabilityItem> Pair(VisitAcquisition a, VisitAcquisition b)
    {
        var r = new List<ComparabilityItem>();
        void Add(string item, string? x, string? y, Severity s, string msg) => r.Add(new(a.VisitIndex, b.VisitIndex, item, x, y, s, msg));

        foreach (var (name, pa, pb) in new[] { ("t2w", a.T2w, b.T2w), ("dwi", a.Diffusion, b.Diffusion) })
        {
            if (pa is null || pb is null) continue;
            if (pa.FieldStrengthT is double fa && pb.FieldStrengthT is double fb && Math.Abs(fa - fb) > 0.1)
                Add($"{name}.fieldStrength", F(fa, "T"), F(fb, "T"), Severity.Critical, "field strength differs: ADC and T2w contrast are not directly comparable");
            if (Differs(pa.Manufacturer, pb.Manufacturer))
                Add($"{name}.manufacturer", pa.Manufacturer, pb.Manufacturer, Severity.Warning, "scanner manufacturer differs: expect a systematic ADC offset between vendors");
            else if (Differs(pa.Model, pb.Model))
                Add($"{name}.model", pa.Model, pb.Model, Severity.Info, "scanner model differs");
            Relative(Add, $"{name}.sliceThickness", pa.SliceThicknessMm, pb.SliceThicknessMm, "mm", "slice thickness differs: partial-volume effects on volumes and ADC change");
            Relative(Add, $"{name}.echoTime", pa.EchoTimeMs, pb.EchoTimeMs, "ms", "echo time differs: signal contrast changes", maxSeverity: Severity.Warning);
            Relative(Add, $"{name}.repetitionTime", pa.RepetitionTimeMs, pb.RepetitionTimeMs, "ms", "repetition time differs: signal contrast changes", maxSeverity: Severity.Warning);
        }
        Spacing(Add, "t2w.voxelSize", a.T2wSpacingMm, b.T2wSpacingMm);
        Spacing(Add, "adc.voxelSize", a.AdcSpacingMm, b.AdcSpacingMm);
        BValues(Add, a.BValues, b.BValues);
        if (a.AdcSource is { } sa && b.AdcSource is { } sb && sa != sb)
            Add("adc.source", sa.ToString().ToLowerInvariant(), sb.ToString().ToLowerInvariant(), Severity.Warning,
                "ADC source differs (scanner vs computed): fitting method and b-values may differ");
        return r;
    }

    private static void Relative(Action<string, string?, string?, Severity, string> add, string item, double? x, double? y, string unit, string msg,
        Severity maxSeverity = Severity.Critical)
    {
        if (x is not double a || y is not double b || !(a > 0) || !(b > 0)) return;
        double rel = Math.Abs(b - a) / a;
        if (rel <= InfoRel) return;
        var s = rel > CriticalRel ? Severity.Critical : rel > WarningRel ? Severity.Warning : Severity.Info;
        if (s > maxSeverity) s = maxSeverity;
        add(item, F(a, unit), F(b, unit), s, msg + string.Create(CultureInfo.InvariantCulture, $" ({rel:P0})"));
    }

    private static void Spacing(Action<string, string?, string?, Severity, string> add, string item, Vec3? x, Vec3? y)
    {
        if (x is not Vec3 a || y is not Vec3 b) return;
        double va = a.X * a.Y * a.Z, vb = b.X * b.Y * b.Z;
        Relative(add, item, va, vb, "mm3", $"voxel size differs ({V(a)} vs {V(b)} mm): partial-volume effects on volumes change");
    }

    private static void BValues(Action<string, string?, string?, Severity, string> add, IReadOnlyList<double> a, IReadOnlyList<double> b)
    {
        if (a.Count == 0 || b.Count == 0) return;
        string sa = string.Join(",", a.Select(v => v.ToString("0", CultureInfo.InvariantCulture)));
        string sb = string.Join(",", b.Select(v => v.ToString("0", CultureInfo.InvariantCulture)));
        if (sa == sb) return;
        bool sameRange = Math.Abs(a[0] - b[0]) <= 1 && Math.Abs(a[^1] - b[^1]) <= 1;
        add("adc.bValues", sa, sb, sameRange ? Severity.Info : Severity.Warning,
            sameRange ? "intermediate b-values differ; lowest and highest agree"
                      : "the b-values used for ADC differ: ADC depends on the b-value range (perfusion at low b, kurtosis at high b)");
    }

    private static bool Differs(string? a, string? b) =>
        !string.IsNullOrWhiteSpace(a) && !string.IsNullOrWhiteSpace(b) && !string.Equals(a.Trim(), b.Trim(), StringComparison.OrdinalIgnoreCase);

    private static string F(double v, string unit) => string.Create(CultureInfo.InvariantCulture, $"{v:0.###} {unit}");

    private static string V(Vec3 v) => string.Create(CultureInfo.InvariantCulture, $"{v.X:0.##}x{v.Y:0.##}x{v.Z:0.##}");
}
