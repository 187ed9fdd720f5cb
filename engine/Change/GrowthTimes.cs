namespace Serimetry.Engine.Change;

/// <summary>
/// Doubling and halving times from a specific growth rate k (per year) on the natural-log scale:
/// V(t) = V1·e^{k(t−t1)}, DT = ln2/k (Src: Schwartz, Cancer 1961;14:1272; Mehrara et al., Cancer Res
/// 2007;67:3970; facts.md §7). A CI [kLow, kHigh] maps to a DT CI by inversion; when it spans 0 the far
/// end is unbounded (null).
/// </summary>
public static class GrowthTimes
{
    /// <summary>Doubling time ln2/k for k &gt; 0, else null.</summary>
    public static double? DoublingTime(double k) => k > 0 && double.IsFinite(k) ? Math.Log(2) / k : null;

    /// <summary>Halving time ln2/|k| for k &lt; 0, else null.</summary>
    public static double? HalvingTime(double k) => k < 0 && double.IsFinite(k) ? Math.Log(2) / -k : null;

    /// <summary>
    /// CI of the doubling time (k &gt; 0) or halving time (k &lt; 0) from the CI of k: [ln2/|far|, ln2/|near|],
    /// with the upper end null (unbounded) when the CI of k reaches 0 or crosses it. Null when k is 0 or the CI is unknown.
    /// </summary>
    public static double?[]? TimeCi(double k, double kLow, double kHigh)
    {
        if (!double.IsFinite(kLow) || !double.IsFinite(kHigh) || k == 0) return null;
        double ln2 = Math.Log(2);
        if (k > 0)
            return [ln2 / kHigh, kLow > 0 ? ln2 / kLow : null];
        return [ln2 / -kLow, kHigh < 0 ? ln2 / -kHigh : null];
    }

    /// <summary>
    /// Two-point specific growth rate k = ln(V2/V1)/(t2 − t1) (per unit of t) and, when the log-scale
    /// repeatability σL is known, its 95 % CI [ln(V2/V1) ± 1.96·√2·σL]/(t2 − t1) (facts.md §7, derived from §1).
    /// </summary>
    public static (double K, double Low, double High) TwoPointRate(double v1, double t1, double v2, double t2, double? sigmaLog)
    {
        if (!(v1 > 0) || !(v2 > 0)) throw new ArgumentException("growth rates need positive values");
        if (!(t2 > t1)) throw new ArgumentException("the second time must be later than the first");
        double dt = t2 - t1, lr = Math.Log(v2 / v1), k = lr / dt;
        if (sigmaLog is not double s) return (k, double.NaN, double.NaN);
        double half = ChangeBands.Z975 * Math.Sqrt(2) * s;
        return (k, (lr - half) / dt, (lr + half) / dt);
    }
}
