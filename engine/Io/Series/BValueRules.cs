using System.Globalization;
using System.Text.RegularExpressions;

namespace Serimetry.Engine.Io.Series;

/// <summary>A b-value and where it was found.</summary>
/// <param name="BValue">s/mm², or null when no rule found one.</param>
/// <param name="Source">Which attribute or convention gave it (shown to users).</param>
public sealed record BValueFinding(double? BValue, string Source)
{
    public static readonly BValueFinding Unknown = new(null, "b-value unknown");
}

/// <summary>
/// Finds the diffusion b-value of one slice. The standard attribute comes first; vendor encodings are
/// fallbacks used only when it is absent, each one labelled "common practice" with where it was observed.
/// </summary>
public static partial class BValueRules
{
    /// <summary>Source label of the standard attribute (PS3.3 C.8.13.5.9 MR Diffusion macro).</summary>
    public const string StandardSource = "Diffusion b-value (0018,9087)";

    /// <summary>Source label of the Siemens private element.</summary>
    public const string SiemensSource = "Siemens private (0019,xx0C) of creator \"SIEMENS MR HEADER\" (common practice)";

    /// <summary>Source label of the Sequence Name convention.</summary>
    public const string SequenceNameSource = "Sequence Name (0018,0024) pattern ep_b<N> (common practice)";

    /// <summary>Largest b-value accepted from any source, s/mm²; larger numbers are treated as garbage.</summary>
    public const double MaxPlausibleBValue = 100_000;

    /// <summary>
    /// The b-value of a slice:
    /// 1. Diffusion b-value (0018,9087) at top level or in the MR Diffusion functional group (0018,9117);
    /// 2. Siemens private b-value (ASCII digits): common practice, observed in the Siemens Skyra and
    ///    TrioTim PROSTATEx exams (VR OB, e.g. bytes "400 ");
    /// 3. Sequence Name "*ep_b400t", "ep_b0", "ep_b1000#1" (the whole name must match, so the ADC and
    ///    computed series' "*ep_b50_800" gives nothing): common practice, observed in the same exams.
    /// GE and Philips private encodings are not used: no file here shows them, so such series report
    /// "b-value unknown" unless they carry the standard attribute.
    /// </summary>
    public static BValueFinding Find(SliceHeader s)
    {
        if (s.DiffusionBValue is { } b && IsPlausible(b)) return new BValueFinding(b, StandardSource);
        if (ParseSiemensText(s.SiemensBValueText) is { } sb) return new BValueFinding(sb, SiemensSource);
        if (ParseSequenceName(s.SequenceName) is { } qb) return new BValueFinding(qb, SequenceNameSource);
        return BValueFinding.Unknown;
    }

    /// <summary>Parses the Siemens private text: digits with optional padding (spaces or NUL); null if not a number.</summary>
    internal static double? ParseSiemensText(string? text)
    {
        if (text is null) return null;
        var t = text.Trim(' ', '\0');
        if (t.Length == 0 || t.Length > 12) return null;
        if (!double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out var v)) return null;
        return IsPlausible(v) ? v : null;
    }

    /// <summary>Parses a Sequence Name of the form [*]ep_b&lt;digits&gt;[t | #&lt;digits&gt;]; null otherwise.</summary>
    internal static double? ParseSequenceName(string? name)
    {
        if (name is null) return null;
        var m = SequenceNamePattern().Match(name.Trim());
        if (!m.Success) return null;
        var v = double.Parse(m.Groups["b"].Value, CultureInfo.InvariantCulture);
        return IsPlausible(v) ? v : null;
    }

    private static bool IsPlausible(double b) => double.IsFinite(b) && b >= 0 && b <= MaxPlausibleBValue;

    [GeneratedRegex(@"^\*?ep_b(?<b>\d{1,6})(t|#\d*)?$", RegexOptions.CultureInvariant)]
    private static partial Regex SequenceNamePattern();
}
