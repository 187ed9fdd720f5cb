namespace Serimetry.Engine.Diffusion;

/// <summary>
/// Comparability of two ADC maps' b-value sets: ADC depends on the b-values used (perfusion at low b, kurtosis
/// and noise floor at high b), so a change between exams fitted from different b-values is partly protocol.
/// </summary>
public static class BValueComparability
{
    /// <summary>A warning naming both sets when they differ by more than 1 s/mm² in any element; null when equal.</summary>
    public static string? Compare(IReadOnlyList<double> baseline, IReadOnlyList<double> followUp)
    {
        var a = baseline.Distinct().Order().ToArray();
        var b = followUp.Distinct().Order().ToArray();
        bool same = a.Length == b.Length && a.Zip(b).All(p => Math.Abs(p.First - p.Second) <= 1);
        if (same) return null;
        return $"ADC b-values differ: baseline {Format(a)} s/mm² vs follow-up {Format(b)} s/mm²; ADC change partly reflects the protocol";
    }

    private static string Format(double[] v) => string.Join("/", v.Select(x => x.ToString("0.###", System.Globalization.CultureInfo.InvariantCulture)));
}
