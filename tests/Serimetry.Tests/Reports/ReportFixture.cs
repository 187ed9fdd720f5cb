using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Reports;
using Serimetry.Engine.Repeatability;
using Serimetry.Tests.Measures;

namespace Serimetry.Tests.Reports;

/// <summary>
/// A three-visit comparison computed end to end from synthetic images (growing spherical lesion, fixed
/// gland, ADC falling inside the lesion), used by the report, schema and CSV tests.
/// </summary>
internal static class ReportFixture
{
    public static readonly Vec3 Centre = new(2, -3, 15);

    public static readonly RepeatabilityProfile Profile = new("test profile", [
        new("lesion.volume", ErrorScale.Log, null, 0.10, "1", "test entry"),
        new("lesion.adc.median", ErrorScale.Log, null, 0.17, "1", "Boss et al., JMRI 2022 (QIBA prostate claim)"),
        new("lesion.adc.skewness", ErrorScale.Absolute, 0.3, null, "1", "test entry"),
    ]);

    private static readonly Lazy<ChangeReport> DefaultReport = new(() => Build());

    /// <summary>The default three-visit report, built once.</summary>
    public static ChangeReport Default => DefaultReport.Value;

    public static ChangeReport Build(Func<IMeasure, bool>? keep = null, IMeasure? extra = null, IReadOnlyList<string>? problems = null)
    {
        var registry = MeasureRegistry.CreateDefault();
        if (extra is not null) registry.Register(extra);
        var measures = registry.All.Where(keep ?? (_ => true)).ToList();
        var dates = new[] { new DateOnly(2021, 3, 4), new DateOnly(2022, 9, 1), new DateOnly(2024, 2, 15) };
        var radii = new[] { 5.0, 6.0, 7.5 };
        var psa = new List<PsaSample> { new(dates[0], 5.1), new(new DateOnly(2022, 1, 10), 5.6), new(dates[1], 6.0), new(dates[2], 7.4) };
        var visits = new List<VisitInput>();
        for (int v = 0; v < 3; v++)
        {
            var ctx = Context(v, dates[v], radii[v], PsaKinetics.ValueNear(psa, dates[v]));
            var values = MeasureRunner.Run(measures, ctx);
            var samples = LesionAdcSamples.Collect(ctx, out _)?.Values;
            var reg = v == 0 ? null : new RegistrationRecord(new TransformRecord("rigid", [1, 0, 0, 0.5, 0, 1, 0, -1, 0, 0, 1, 2, 0, 0, 0, 1]),
                -0.41, -0.63, 0.91, ["converged"]);
            var refit = v == 0 ? null : new LesionRefitRecord(0.87, 0.6, []);
            visits.Add(new VisitInput(v, dates[v], $"2.25.{1000 + v}", reg, values, samples, refit));
        }
        var acq = Enumerable.Range(0, 3).Select(v => new VisitAcquisition(v, new AcquisitionInfo(3, "Acme", "M1", 4000, 100, v == 2 ? 4 : 3),
            null, v == 2 ? [0, 1000] : [50, 800], new Vec3(0.5, 0.5, 3), new Vec3(2, 2, 3), AdcSource.Scanner)).ToList();
        return ChangeReportBuilder.Build(visits, measures.Select(MeasureDescriptor.From).ToList(), Profile, psa, acq, problems: problems);
    }

    private static VisitContext Context(int index, DateOnly date, double lesionRadius, double? psa)
    {
        var t2g = SyntheticMasks.Centred(new Size3(96, 96, 20), new Vec3(0.5, 0.5, 3), Mat3.Identity, Centre);
        var adcg = SyntheticMasks.Centred(new Size3(28, 28, 20), new Vec3(2, 2, 3), Mat3.Identity, Centre);
        var lesion = SyntheticMasks.Ellipsoid(t2g, Centre, new Vec3(lesionRadius, lesionRadius, lesionRadius));
        var gland = SyntheticMasks.Ellipsoid(t2g, Centre, new Vec3(20, 17, 18));
        double lesionAdc = 1000 - 60 * index;
        var t2 = SyntheticMasks.Image(t2g, p => (p - Centre).Norm <= lesionRadius ? 60f + (float)(p.X % 3) : 100f + (float)(p.Y % 7));
        var adc = SyntheticMasks.Image(adcg, p => (p - Centre).Norm <= lesionRadius + 1 ? (float)(lesionAdc + 20 * Math.Sin(p.X + p.Y)) : 1500f + (float)(p.Z % 5));
        return new VisitContext(index, date, t2) { Adc = adc, LesionMask = lesion, GlandMask = gland, PsaNgPerMl = psa };
    }
}
