using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Change;

/// <summary>One dated value of a series.</summary>
public readonly record struct DatedValue(DateOnly Date, double Value);

/// <summary>
/// Fits a trend over dated values: OLS with t-based CI for three or more points; with two points the
/// two-point rate (Schwartz 1961) with a CI from the repeatability entry when one applies (facts.md §7).
/// Time is in years of 365.25 days from the first date.
/// </summary>
public static class TrendFitter
{
    /// <summary>Days per year used to express slopes per year.</summary>
    public const double DaysPerYear = 365.25;

    /// <summary>The trend, or null when fewer than two usable points remain. Dates must be strictly increasing.</summary>
    public static MeasureTrend? Fit(string measure, string unit, TrendScale scale, IReadOnlyList<DatedValue> points,
        RepeatabilityEntry? entry = null)
    {
        RequireIncreasing(points, measure);
        var flags = new List<string>();
        var x = new List<double>();
        var y = new List<double>();
        foreach (var p in points)
        {
            if (!double.IsFinite(p.Value)) continue;
            if (scale == TrendScale.Log && !(p.Value > 0))
            {
                flags.Add($"value {p.Value} on {p.Date:yyyy-MM-dd} is not positive and was left out of the log-scale fit");
                continue;
            }
            x.Add((p.Date.DayNumber - points[0].Date.DayNumber) / DaysPerYear);
            y.Add(scale == TrendScale.Log ? Math.Log(p.Value) : p.Value);
        }
        if (x.Count < 2) return null;
        double slope, lo, hi;
        string method;
        if (x.Count >= 3)
        {
            var fit = LinearFit.Fit(x.ToArray(), y.ToArray());
            (slope, lo, hi, method) = (fit.Slope, fit.SlopeCiLow, fit.SlopeCiHigh, "ols");
        }
        else
        {
            (slope, lo, hi) = TwoPoint(scale, x, y, entry, flags);
            method = "two-point";
        }
        double[]? ci = double.IsFinite(lo) && double.IsFinite(hi) ? [lo, hi] : null;
        return WithTimes(new MeasureTrend(measure, unit, scale, scale == TrendScale.Log ? "1/yr (natural log)" : $"{unit}/yr",
            slope, ci, null, null, null, x.Count, method, flags));
    }

    private static (double, double, double) TwoPoint(TrendScale scale, List<double> x, List<double> y, RepeatabilityEntry? entry, List<string> flags)
    {
        double dt = x[1] - x[0], slope = (y[1] - y[0]) / dt;
        double? half = null;
        if (scale == TrendScale.Log && entry is { Scale: ErrorScale.Log, WithinSubjectCv: double wcv })
            half = ChangeBands.Z975 * Math.Sqrt(2) * ChangeBands.LogSd(wcv) / dt;
        else if (scale == TrendScale.Linear && entry is { Scale: ErrorScale.Absolute, WithinSubjectSd: double wsd })
            half = ChangeBands.RepeatabilityCoefficient(wsd) / dt;
        if (half is double h) return (slope, slope - h, slope + h);
        flags.Add("two visits and no matching repeatability entry: no CI for the slope");
        return (slope, double.NaN, double.NaN);
    }

    private static MeasureTrend WithTimes(MeasureTrend t)
    {
        if (t.Scale != TrendScale.Log) return t;
        var flags = t.Flags as List<string> ?? [.. t.Flags];
        double?[]? timeCi = t.Ci95 is { } ci ? GrowthTimes.TimeCi(t.SlopePerYear, ci[0], ci[1]) : null;
        if (timeCi is { } tc && tc[1] is null)
            flags.Add("the slope CI includes 0: the doubling/halving time is unbounded above");
        return t with
        {
            DoublingTimeYears = GrowthTimes.DoublingTime(t.SlopePerYear),
            HalvingTimeYears = GrowthTimes.HalvingTime(t.SlopePerYear),
            TimeCi95Years = timeCi,
            Flags = flags,
        };
    }

    /// <summary>Throws a clear error when dates are not strictly increasing.</summary>
    internal static void RequireIncreasing(IReadOnlyList<DatedValue> points, string what)
    {
        for (int i = 1; i < points.Count; i++)
            if (points[i].Date <= points[i - 1].Date)
                throw new Core.InvalidParameterException(
                    $"dates are out of order: value {i + 1} ({points[i].Date:yyyy-MM-dd}) is not after value {i} ({points[i - 1].Date:yyyy-MM-dd})",
                    what, "give the values in date order, one per date");
    }
}
