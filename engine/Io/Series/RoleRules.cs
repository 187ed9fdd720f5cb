using Serimetry.Engine.Io;

namespace Serimetry.Engine.Io.Series;

/// <summary>A role and the rule that gave it.</summary>
/// <param name="Role">The role.</param>
/// <param name="Reason">The rule, in words (shown by <c>inspect</c>).</param>
/// <param name="IsComputed">True for a scanner-computed image (e.g. a calculated high-b series).</param>
public sealed record RoleDecision(SeriesRole Role, string Reason, bool IsComputed = false);

/// <summary>
/// Assigns a <see cref="SeriesRole"/> to a series. Standard attributes come first, Series Description
/// words last. Every rule is common practice (no standard defines "the T2-weighted series of a
/// prostate exam"); the rules and thresholds are documented in docs/series.md.
/// </summary>
public static class RoleRules
{
    /// <summary>T2w needs a spin-echo family sequence with TE at least this long (ms). Common practice.</summary>
    public const double T2MinEchoTimeMs = 60;

    /// <summary>T2w needs TR at least this long (ms). Common practice.</summary>
    public const double T2MinRepetitionTimeMs = 1500;

    /// <summary>Classifies one series from its slices (all slices are looked at, first match wins).</summary>
    public static RoleDecision Classify(IReadOnlyList<SliceHeader> slices)
    {
        ArgumentNullException.ThrowIfNull(slices);
        if (slices.Count == 0) return new RoleDecision(SeriesRole.Other, "no images");
        var first = slices[0];
        bool computed = IsComputedHighB(first);
        var types = ImageTypes(slices);

        if (types.Contains("ADC"))
            return new RoleDecision(SeriesRole.Adc, "Image Type contains ADC");
        if (types.Contains("FA") || types.Contains("EXP") || types.Contains("EADC"))
            return new RoleDecision(SeriesRole.Other, "Image Type marks a derived diffusion map (FA/EXP/EADC)");
        if (types.Contains("DIFFUSION") || types.Contains("TRACEW"))
            return new RoleDecision(SeriesRole.Dwi, "Image Type contains DIFFUSION/TRACEW", computed);
        if (slices.Any(s => s.DiffusionBValue is not null))
            return new RoleDecision(SeriesRole.Dwi, "Diffusion b-value (0018,9087) present", computed);
        if (first.ScanningSequence.Contains("EP") && slices.Any(s => BValueRules.Find(s).BValue is not null))
            return new RoleDecision(SeriesRole.Dwi, "echo-planar with b-values (vendor encoding)", computed);
        if (IsT2Weighted(first))
            return new RoleDecision(SeriesRole.T2w,
                $"spin-echo sequence with TE >= {T2MinEchoTimeMs} ms and TR >= {T2MinRepetitionTimeMs} ms");
        if (HasAcquisitionAttributes(first))
            return new RoleDecision(SeriesRole.Other, "acquisition attributes match no rule");
        return FromDescription(first.SeriesDescription, computed);
    }

    /// <summary>
    /// A scanner-computed high-b image: Series Description contains CALC_BVAL / CALCBVAL (observed in the
    /// Siemens PROSTATEx exams, common practice).
    /// </summary>
    public static bool IsComputedHighB(SliceHeader s)
    {
        var d = Normalise(s.SeriesDescription);
        return d.Contains("CALCBVAL", StringComparison.Ordinal);
    }

    internal static bool IsT2Weighted(SliceHeader s)
    {
        bool spinEcho = s.ScanningSequence.Contains("SE") && !s.ScanningSequence.Contains("EP")
            && !s.ScanningSequence.Contains("IR");
        return spinEcho && s.EchoTimeMs >= T2MinEchoTimeMs && s.RepetitionTimeMs >= T2MinRepetitionTimeMs;
    }

    private static bool HasAcquisitionAttributes(SliceHeader s) =>
        s.ScanningSequence.Count > 0 && s.EchoTimeMs is not null && s.RepetitionTimeMs is not null;

    /// <summary>Last resort: words of the Series Description (common practice).</summary>
    internal static RoleDecision FromDescription(string? description, bool computed)
    {
        var d = Normalise(description);
        if (d.Length == 0) return new RoleDecision(SeriesRole.Other, "no attributes and no Series Description to go by");
        if (d.Contains("ADC", StringComparison.Ordinal))
            return new RoleDecision(SeriesRole.Adc, "Series Description contains ADC (last resort)");
        if (d.Contains("DWI", StringComparison.Ordinal) || d.Contains("DIFF", StringComparison.Ordinal)
            || d.Contains("TRACE", StringComparison.Ordinal) || computed)
            return new RoleDecision(SeriesRole.Dwi, "Series Description names diffusion (last resort)", computed);
        if (d.Contains("T2", StringComparison.Ordinal))
            return new RoleDecision(SeriesRole.T2w, "Series Description contains T2 (last resort)");
        return new RoleDecision(SeriesRole.Other, "no rule matched");
    }

    private static HashSet<string> ImageTypes(IReadOnlyList<SliceHeader> slices)
    {
        var set = new HashSet<string>(StringComparer.Ordinal);
        foreach (var s in slices)
            foreach (var t in s.ImageType) set.Add(t.Trim().ToUpperInvariant());
        return set;
    }

    /// <summary>Upper case with separators removed, so "CALC_BVAL" and "CALCBVAL" compare equal.</summary>
    private static string Normalise(string? text)
    {
        if (string.IsNullOrWhiteSpace(text)) return "";
        var chars = text.ToUpperInvariant().Where(char.IsLetterOrDigit).ToArray();
        return new string(chars);
    }
}
