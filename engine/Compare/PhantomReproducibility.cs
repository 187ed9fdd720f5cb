using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Robustness;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Compare;

/// <summary>How often pairs of re-acquisitions without true change were flagged as change.</summary>
/// <param name="Measure">Measure id.</param>
/// <param name="Pairs">Pairs of repeats compared (R·(R−1)/2).</param>
/// <param name="ExceedingProfile">Pairs whose difference exceeds the profile's 95 % band.</param>
/// <param name="RateProfile">ExceedingProfile / Pairs; null when the profile has no entry.</param>
/// <param name="ProfileSource">Source of the profile entry used.</param>
/// <param name="ExceedingOwnRc">Pairs whose |difference| exceeds this run's own RC.</param>
/// <param name="RateOwnRc">ExceedingOwnRc / Pairs (about 0.05 by construction for normal errors).</param>
public sealed record FalsePositiveRate(string Measure, int Pairs, int ExceedingProfile, double? RateProfile, string? ProfileSource,
    int ExceedingOwnRc, double RateOwnRc);

/// <summary>Result of a phantom QA run.</summary>
/// <param name="Repeats">Re-acquisitions made.</param>
/// <param name="Observations">Measured values (subject = phantom subject id, repeat = "r1", "r2" …).</param>
/// <param name="Statistics">wSD, wCV, RC per measure over the repeats (ICCs are undefined with one phantom).</param>
/// <param name="FalsePositiveRates">Change-exceeds-noise rate among pairs without true change.</param>
/// <param name="ProfileName">Profile the rates were judged against.</param>
public sealed record PhantomReproducibilityReport(int Repeats, IReadOnlyList<RepeatabilityObservation> Observations,
    TestRetestReport Statistics, IReadOnlyList<FalsePositiveRate> FalsePositiveRates, string ProfileName)
{
    /// <summary>
    /// Radiomic features of every repeat (lesion and gland, T2w and ADC), as a test-retest feature table
    /// (<see cref="TestRetestTable"/>); empty unless radiomics were requested.
    /// </summary>
    public IReadOnlyList<TestRetestValue> RadiomicFeatures { get; init; } = [];
}

/// <summary>
/// Phantom QA run: R noisy re-acquisitions of one phantom (same anatomy and position, only the noise seed
/// differs, so there is no true change), measured exactly as <c>compare</c> measures a visit (the lesion
/// re-fitted from the phantom's outline with <see cref="LesionRefit"/>, then every registered measure), their
/// repeatability, and the rate at which "change exceeds noise" would be flagged between re-acquisitions — the
/// engine's own noise floor. No registration is involved (the phantom does not move between repeats).
/// </summary>
public static class PhantomReproducibility
{
    /// <summary>
    /// Runs the QA; <paramref name="progress"/> is told after each repeat. With <paramref name="radiomics"/> settings the
    /// radiomic features of every repeat are computed as compare computes them (<see cref="PhantomReproducibilityReport.RadiomicFeatures"/>).
    /// </summary>
    public static PhantomReproducibilityReport Run(PhantomSpec spec, int repeats, RepeatabilityProfile? profile = null,
        Action<int>? progress = null, int maxDegreeOfParallelism = -1, RadiomicsSettings? radiomics = null)
    {
        ArgumentNullException.ThrowIfNull(spec);
        if (repeats is < 2 or > 1000)
            throw new InvalidParameterException($"repeats must be 2-1000, got {repeats}", "--repeats", "repeatability needs at least two re-acquisitions");
        profile ??= RepeatabilityProfile.LoadDefault();
        var single = spec with { Visits = 1, PsaNgPerMl = spec.PsaNgPerMl.Take(1).ToArray() };
        var rows = new List<RepeatabilityObservation>();
        var features = new List<TestRetestValue>();
        for (int r = 0; r < repeats; r++)
        {
            var visit = PhantomGenerator.Generate(single with { NoiseSeed = unchecked((spec.NoiseSeed ?? spec.Seed) + 1000 * (r + 1)) },
                maxDegreeOfParallelism).Visits[0];
            var (gland, lesion) = Outlines(visit);
            foreach (var (m, v) in MeasureVisit(visit, gland, lesion)) rows.Add(new RepeatabilityObservation(spec.SubjectId, m, $"r{r + 1}", v));
            if (radiomics is not null)
                foreach (var (region, image, values, _) in VisitRadiomics.Regions(visit.T2w, visit.Adc, lesion, gland, radiomics))
                    foreach (var f in values ?? []) features.Add(new TestRetestValue(spec.SubjectId, r, f, region, image));
            progress?.Invoke(r + 1);
        }
        var stats = TestRetestAnalysis.Analyse(rows);
        var rates = stats.Measures.Select(m => Rate(m, rows.Where(x => x.Measure == m.Measure).Select(x => x.Value).ToArray(), profile)).ToList();
        return new PhantomReproducibilityReport(repeats, rows, stats, rates, profile.Name) { RadiomicFeatures = features };
    }

    /// <summary>The phantom's gland outline and its lesion re-fitted as compare re-fits a follow-up lesion.</summary>
    private static (Volume<byte> Gland, Volume<byte> Lesion) Outlines(PhantomVisit visit)
    {
        var settings = new LesionRefitSettings();
        var gland = MaskOps.Binarize(visit.GlandMask);
        var lesion = MaskOps.Binarize(visit.LesionMask);
        var adcOnT2w = Resampler.Resample(visit.Adc, visit.T2w.Geometry, null, Interpolation.Linear, float.NaN);
        var model = LesionRefit.Learn(visit.T2w, adcOnT2w, lesion, gland, settings);
        return (gland, LesionRefit.Refit(visit.T2w, adcOnT2w, lesion, gland, model, settings).Mask);
    }

    /// <summary>The visit's measures with status ok, measured as the comparison pipeline measures a visit.</summary>
    private static IEnumerable<(string Measure, double Value)> MeasureVisit(PhantomVisit visit, Volume<byte> gland, Volume<byte> lesion)
    {
        var context = new VisitContext(0, visit.Date, visit.T2w) { Adc = visit.Adc, GlandMask = gland, LesionMask = lesion };
        return MeasureRunner.Run(MeasureRegistry.CreateDefault().All, context)
            .Where(p => p.Value.Status == MeasureStatus.Ok && p.Value.Value is not null)
            .OrderBy(p => p.Key, StringComparer.Ordinal)
            .Select(p => (p.Key, p.Value.Value!.Value));
    }

    private static FalsePositiveRate Rate(MeasureRepeatability m, double[] values, RepeatabilityProfile profile)
    {
        var entry = profile.Find(m.Measure);
        int pairs = 0, overProfile = 0, overOwn = 0;
        for (int i = 0; i < values.Length; i++)
            for (int j = i + 1; j < values.Length; j++)
            {
                pairs++;
                if (Math.Abs(values[j] - values[i]) > m.Rc) overOwn++;
                if (entry is not null && Exceeds(entry, values[i], values[j])) overProfile++;
            }
        return new FalsePositiveRate(m.Measure, pairs, overProfile, entry is null ? null : (double)overProfile / pairs, entry?.Source,
            overOwn, (double)overOwn / pairs);
    }

    /// <summary>Log scale: |ln(b/a)| &gt; 1.96·√2·σL; absolute scale: |b − a| &gt; 1.96·√2·wSD (facts.md §1).</summary>
    internal static bool Exceeds(RepeatabilityEntry e, double a, double b)
    {
        if (e.Scale == ErrorScale.Log && e.SdLog is double s && a > 0 && b > 0)
            return Math.Abs(Math.Log(b / a)) > TestRetestAnalysis.RcFactor * s;
        return e.RepeatabilityCoefficient is double rc && Math.Abs(b - a) > rc;
    }
}
