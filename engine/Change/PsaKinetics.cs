using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;

namespace Serimetry.Engine.Change;

/// <summary>One serum PSA result.</summary>
public sealed record PsaSample(DateOnly Date, double NgPerMl);

/// <summary>
/// PSA kinetics over the PSA series (which may have more dates than imaging visits): PSA doubling time
/// from the OLS slope of ln(PSA) on time, DT = ln2/slope (Src: Pound et al. 1999 via facts.md §6), and
/// PSA velocity, the OLS slope of PSA on time in ng/mL/yr (Src: Carter et al., Urology 1995; facts.md §6).
/// Working-group advice (≥ 3 values, ≥ 4 weeks apart) is flagged, not enforced.
/// </summary>
public static class PsaKinetics
{
    /// <summary>Trend id of the log-scale PSA fit (doubling time).</summary>
    public const string DoublingId = "psa";

    /// <summary>Trend id of the linear PSA fit (velocity).</summary>
    public const string VelocityId = "psa.velocity";

    /// <summary>Checks values (finite, &gt; 0) and order (strictly increasing dates); throws a clear error otherwise.</summary>
    public static void Validate(IReadOnlyList<PsaSample> samples)
    {
        for (int i = 0; i < samples.Count; i++)
        {
            var s = samples[i];
            if (!double.IsFinite(s.NgPerMl) || s.NgPerMl <= 0)
                throw new InvalidParameterException(string.Create(CultureInfo.InvariantCulture,
                    $"PSA value {i + 1} ({s.Date:yyyy-MM-dd}) is {s.NgPerMl} ng/mL; expected a positive number"), "--psa",
                    "give PSA as YYYY-MM-DD=ng/mL with a positive value");
            if (i > 0 && s.Date <= samples[i - 1].Date)
                throw new InvalidParameterException(
                    $"PSA dates are out of order: value {i + 1} ({s.Date:yyyy-MM-dd}) is not after value {i} ({samples[i - 1].Date:yyyy-MM-dd})",
                    "--psa", "list PSA values in date order, one per date");
        }
    }

    /// <summary>The doubling-time (log) and velocity (linear) trends; empty with fewer than two values.</summary>
    public static IReadOnlyList<MeasureTrend> Trends(IReadOnlyList<PsaSample> samples)
    {
        Validate(samples);
        var points = samples.Select(s => new DatedValue(s.Date, s.NgPerMl)).ToList();
        var result = new List<MeasureTrend>();
        foreach (var (id, scale) in new[] { (DoublingId, TrendScale.Log), (VelocityId, TrendScale.Linear) })
        {
            var t = TrendFitter.Fit(id, "ng/mL", scale, points);
            if (t is null) continue;
            var flags = t.Flags.ToList();
            if (samples.Count < 3) flags.Add("fewer than 3 PSA values (PSA Working Group advice: at least 3, 4 weeks apart)");
            if (MinGapDays(samples) < 28) flags.Add("some PSA values are less than 4 weeks apart");
            result.Add(t with { Flags = flags });
        }
        return result;
    }

    /// <summary>The PSA value closest in time to <paramref name="date"/> within <paramref name="maxDays"/>, or null.</summary>
    public static double? ValueNear(IReadOnlyList<PsaSample> samples, DateOnly date, int maxDays = 90)
    {
        PsaSample? best = null;
        foreach (var s in samples)
            if (Math.Abs(s.Date.DayNumber - date.DayNumber) <= maxDays &&
                (best is null || Math.Abs(s.Date.DayNumber - date.DayNumber) < Math.Abs(best.Date.DayNumber - date.DayNumber)))
                best = s;
        return best?.NgPerMl;
    }

    private static int MinGapDays(IReadOnlyList<PsaSample> s)
    {
        int min = int.MaxValue;
        for (int i = 1; i < s.Count; i++) min = Math.Min(min, s[i].Date.DayNumber - s[i - 1].Date.DayNumber);
        return min;
    }
}
