using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Change;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Tests.Change;

/// <summary>Properties of bands and histogram distances that follow from their definitions.</summary>
public class ChangePropertyTests
{
    private static double Unit(NormalFloat f) => Math.Abs(f.Get) % 1.0;

    [Property(MaxTest = 300)]
    public bool LogBandExceedsNoiseExactlyWhenTheLogRatioExceedsRc(NormalFloat baseline, NormalFloat ratio, NormalFloat cv)
    {
        // Definition (facts.md §1): the ratio band excludes 1 ⇔ |ln(Y2/Y1)| > 1.96·√2·σL.
        double y1 = 0.1 + 100 * Unit(baseline), r = 0.2 + 4 * Unit(ratio), wcv = 0.01 + 0.5 * Unit(cv);
        var c = ChangeBands.Compare("m", "mL", 0, 1, y1, y1 * r, new RepeatabilityEntry("m", ErrorScale.Log, null, wcv, "1", "p"));
        double rc = ChangeBands.Z975 * Math.Sqrt(2) * ChangeBands.LogSd(wcv);
        bool expected = Math.Abs(Math.Log(r)) > rc;
        return Math.Abs(Math.Abs(Math.Log(r)) - rc) < 1e-9 || c.ExceedsNoise == expected
            && (c.Ci95![0] <= c.Delta && c.Delta <= c.Ci95[1]);
    }

    [Property(MaxTest = 300)]
    public bool AbsoluteBandExceedsNoiseExactlyWhenDeltaExceedsRc(NormalFloat a, NormalFloat b, NormalFloat sd)
    {
        double y1 = 100 * Unit(a) - 50, y2 = 100 * Unit(b) - 50, wsd = 0.01 + 20 * Unit(sd);
        var c = ChangeBands.Compare("m", "1", 0, 1, y1, y2, new RepeatabilityEntry("m", ErrorScale.Absolute, wsd, null, "1", "p"));
        double rc = ChangeBands.RepeatabilityCoefficient(wsd);
        return Math.Abs(Math.Abs(y2 - y1) - rc) < 1e-9 || c.ExceedsNoise == Math.Abs(y2 - y1) > rc;
    }

    [Property(MaxTest = 100)]
    public bool WassersteinOfAShiftIsTheShiftAndDistancesAreSymmetric(NormalFloat[] values, NormalFloat shift)
    {
        // Definitions: W1(a, a + c) = |c|; W1 and KS are symmetric; KS ∈ [0, 1].
        if (values.Length == 0) return true;
        var a = values.Select(v => (float)(Math.Abs(v.Get) % 1000)).ToArray();
        float c = (float)(shift.Get % 100);
        var b = a.Select(v => v + c).ToArray();
        double expectedShift = b.Zip(a, (x, y) => (double)x - y).Average();
        double w = HistogramDistances.Wasserstein1(a, b), ks = HistogramDistances.KolmogorovSmirnov(a, b);
        return Math.Abs(w - Math.Abs(expectedShift)) < 1e-3
            && Math.Abs(w - HistogramDistances.Wasserstein1(b, a)) < 1e-9
            && Math.Abs(ks - HistogramDistances.KolmogorovSmirnov(b, a)) < 1e-12
            && ks is >= 0 and <= 1;
    }
}
