using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Change;

/// <summary>
/// Builds the change of one measure between two visits with its 95 % band from a repeatability entry
/// (Src: facts.md §1; Bland, "repeatability" note; Obuchowski, Acad Radiol 2018 for the log scale).
/// Absolute scale: band = delta ± RC with RC = 1.96·√2·wSD. Log scale: σL = √(ln(1 + wCV²)) (exact for a
/// log-normal error), ratio band exp(ln(Y2/Y1) ± 1.96·√2·σL), reported on the delta scale as
/// [Y1·(lo − 1), Y1·(hi − 1)]. <c>exceedsNoise</c> = band excludes 0.
/// </summary>
public static class ChangeBands
{
    /// <summary>The 0.975 standard normal quantile used for every 95 % band.</summary>
    public const double Z975 = 1.959963984540054;

    /// <summary>RC = 1.96·√2·wSD (≈ 2.77·wSD).</summary>
    public static double RepeatabilityCoefficient(double withinSubjectSd) => Z975 * Math.Sqrt(2) * withinSubjectSd;

    /// <summary>σL, the SD of ln Y under repeat conditions, from the wCV: √(ln(1 + wCV²)).</summary>
    public static double LogSd(double withinSubjectCv) => Math.Sqrt(Math.Log(1 + withinSubjectCv * withinSubjectCv));

    /// <summary>The change from <paramref name="baseline"/> (visit <paramref name="fromVisit"/>) to <paramref name="followup"/>.</summary>
    public static MeasureChange Compare(string measure, string unit, int fromVisit, int toVisit, double baseline, double followup,
        RepeatabilityEntry? entry)
    {
        if (!double.IsFinite(baseline) || !double.IsFinite(followup))
            throw new ArgumentException("change needs finite values; non-finite values are filtered before this point");
        double delta = followup - baseline;
        double? rel = baseline == 0 ? null : delta / Math.Abs(baseline);
        var flags = new List<string>();
        var none = new MeasureChange(measure, unit, fromVisit, toVisit, baseline, followup, delta, rel, null, null,
            entry?.Source, null, ChangeDirection.Unknown, entry?.Scale ?? ErrorScale.Absolute, null, flags);
        if (entry is null)
        {
            flags.Add("no repeatability entry for this measure: no confidence band");
            return none;
        }
        return entry.Scale == ErrorScale.Absolute ? Absolute(none, entry, flags) : Log(none, entry, flags);
    }

    private static MeasureChange Absolute(MeasureChange c, RepeatabilityEntry entry, List<string> flags)
    {
        if (entry.WithinSubjectSd is not double wsd || !(wsd >= 0))
        {
            flags.Add("the repeatability entry has no wSD for its absolute scale: no confidence band");
            return c;
        }
        double rc = RepeatabilityCoefficient(wsd);
        double lo = c.Delta - rc, hi = c.Delta + rc;
        return Judge(c with { Ci95 = [lo, hi], RepeatabilityCoefficient = rc }, lo, hi);
    }

    private static MeasureChange Log(MeasureChange c, RepeatabilityEntry entry, List<string> flags)
    {
        if (entry.WithinSubjectCv is not double wcv || !(wcv >= 0))
        {
            flags.Add("the repeatability entry has no wCV for its log scale: no confidence band");
            return c;
        }
        if (!(c.Baseline > 0) || !(c.Followup > 0))
        {
            flags.Add("a log-scale band needs positive values at both visits: no confidence band");
            return c;
        }
        double rcLog = Z975 * Math.Sqrt(2) * LogSd(wcv);
        double lr = Math.Log(c.Followup / c.Baseline);
        double rlo = Math.Exp(lr - rcLog), rhi = Math.Exp(lr + rcLog);
        double lo = c.Baseline * (rlo - 1), hi = c.Baseline * (rhi - 1);
        return Judge(c with { Ci95 = [lo, hi], RatioCi95 = [rlo, rhi], RepeatabilityCoefficient = rcLog }, lo, hi);
    }

    private static MeasureChange Judge(MeasureChange c, double lo, double hi)
    {
        bool exceeds = lo > 0 || hi < 0;
        var direction = !exceeds ? ChangeDirection.Stable : lo > 0 ? ChangeDirection.Increase : ChangeDirection.Decrease;
        return c with { ExceedsNoise = exceeds, Direction = direction };
    }
}
