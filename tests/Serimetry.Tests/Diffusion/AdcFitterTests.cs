using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Phantoms;
using Xunit;

namespace Serimetry.Tests.Diffusion;

public sealed class AdcFitterTests
{
    private static readonly double[] BValues = [50, 400, 800, 1400];

    // Tissue ADCs (10^-6 mm²/s): lesion ~800, TZ ~1300, PZ ~1600 (facts.md §3/§4: normal PZ 1.64, central gland 1.31,
    // Jafar et al., World J Radiol 2016; csPCa < 750-900, from memory of PI-RADS v2).
    private static (List<DwiImage> Dwi, Volume<byte> Labels) ThreeTissues(double snr, int seed, Size3? size = null)
    {
        var s = size ?? new Size3(24, 24, 3);
        var g = Geometry.Axial(s, new Vec3(2, 2, 3), Vec3.Zero);
        var labels = new Volume<byte>(g);
        for (int v = 0; v < labels.Voxels.Length; v++) labels.Voxels[v] = (byte)(1 + v % s.X * 3 / s.X);
        double[] adc = [0, 800, 1300, 1600];
        var dwi = new List<DwiImage>();
        var rng = new Random(seed);
        foreach (var b in BValues)
        {
            var vol = new Volume<float>(g);
            for (int v = 0; v < vol.Voxels.Length; v++)
            {
                double sig = 1000 * Math.Exp(-b * adc[labels.Voxels[v]] * 1e-6);
                if (snr > 0)
                {
                    double re = sig + 1000 / snr * Gauss(rng), im = 1000 / snr * Gauss(rng);
                    sig = Math.Sqrt(re * re + im * im);
                }
                vol.Voxels[v] = (float)sig;
            }
            dwi.Add(new DwiImage(b, vol));
        }
        return (dwi, labels);
    }

    private static double Gauss(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());

    private static double RoiMean(Volume<float> map, Volume<byte> labels, byte label)
    {
        double s = 0; int n = 0;
        for (int v = 0; v < map.Voxels.Length; v++) if (labels.Voxels[v] == label) { s += map.Voxels[v]; n++; }
        return s / n;
    }

    [Theory]
    [InlineData(AdcFitMethod.LogLinear)]
    [InlineData(AdcFitMethod.WeightedLogLinear)]
    [InlineData(AdcFitMethod.NonLinear)]
    public void NoiseFreeDataIsRecoveredExactly(AdcFitMethod method)
    {
        // Outside truth: the simulated mono-exponential signal itself (phantom with known ADC).
        var (dwi, labels) = ThreeTissues(0, 1);
        var r = AdcFitter.Fit(dwi, null, new AdcFitOptions(method));
        double[] truth = [0, 800, 1300, 1600];
        for (int v = 0; v < labels.Voxels.Length; v++)
            Assert.Equal(truth[labels.Voxels[v]], r.AdcUm2PerS.Voxels[v], truth[labels.Voxels[v]] * 1e-6);
        Assert.Equal([400.0, 800, 1400], r.BValuesUsed);
        Assert.Equal(labels.Voxels.Length, r.VoxelsFitted);
        Assert.True(r.RSquared.Voxels.All(x => x > 0.999999f));
    }

    // Log fits use b ≤ 1000 for ADC (PI-RADS v2.1: highest b for the ADC map 800-1000, higher not advised; facts.md §4,
    // from memory); the noise-floor-aware non-linear fit also copes with b = 1400 at SNR 30.
    [Theory]
    [InlineData(AdcFitMethod.WeightedLogLinear, 30, 1000)]
    [InlineData(AdcFitMethod.NonLinear, 30, 1400)]
    [InlineData(AdcFitMethod.LogLinear, 50, 1000)]
    public void RoiMeansAreWithinTwoPercentAtRealisticSnr(AdcFitMethod method, double snr, double maxB)
    {
        var (dwi, labels) = ThreeTissues(snr, 42, new Size3(30, 20, 4));
        var bs = BValues.Where(b => b >= 200 && b <= maxB).ToList();
        var r = AdcFitter.Fit(dwi, null, new AdcFitOptions(method, BValues: bs, NoiseSigma: 1000 / snr));
        foreach (var (label, truth) in new[] { ((byte)1, 800.0), ((byte)2, 1300.0), ((byte)3, 1600.0) })
        {
            double m = RoiMean(r.AdcUm2PerS, labels, label);
            Assert.True(Math.Abs(m - truth) <= 0.02 * truth, $"{method} SNR {snr}: label {label} mean {m:F1} vs {truth}");
        }
    }

    [Fact]
    public void ResultIsIndependentOfThreadCount()
    {
        var (dwi, _) = ThreeTissues(20, 5, new Size3(64, 64, 4));
        var a = AdcFitter.Fit(dwi, null, new AdcFitOptions(AdcFitMethod.NonLinear, MaxDegreeOfParallelism: 1));
        var b = AdcFitter.Fit(dwi, null, new AdcFitOptions(AdcFitMethod.NonLinear, MaxDegreeOfParallelism: 4));
        Assert.Equal(a.AdcUm2PerS.Voxels, b.AdcUm2PerS.Voxels);
    }

    [Fact]
    public void MaskLimitsTheFit()
    {
        var (dwi, labels) = ThreeTissues(0, 1);
        var mask = labels.Like<byte>();
        for (int v = 0; v < mask.Voxels.Length; v++) mask.Voxels[v] = (byte)(labels.Voxels[v] == 1 ? 1 : 0);
        var r = AdcFitter.Fit(dwi, mask);
        Assert.Equal(mask.Voxels.Count(x => x == 1), r.VoxelsFitted);
        Assert.Equal(0f, r.AdcUm2PerS.Voxels[Array.IndexOf(mask.Voxels, (byte)0)]);
    }

    [Fact]
    public void NonPositiveSignalsAreDroppedAndCounted()
    {
        var (dwi, _) = ThreeTissues(0, 1);
        dwi[2].Image.Voxels[0] = -5;   // b=800 negative: fit from b=400 and 1400 still exact
        dwi[1].Image.Voxels[1] = 0;    // b=400 zero
        dwi[3].Image.Voxels[1] = 0;    // b=1400 zero: only b=800 left -> failed
        var r = AdcFitter.Fit(dwi);
        Assert.Equal(800, r.AdcUm2PerS.Voxels[0], 800e-6);
        Assert.Equal(0f, r.AdcUm2PerS.Voxels[1]);
        Assert.Equal(1, r.VoxelsFailed);
    }

    [Fact]
    public void MissingBValuesAreClearErrors()
    {
        var (dwi, _) = ThreeTissues(0, 1);
        var e = Assert.Throws<InvalidParameterException>(() => AdcFitter.Fit(dwi, null, new AdcFitOptions(BValues: [400, 1000])));
        Assert.Contains("1000", e.Message);
        Assert.Throws<InvalidParameterException>(() => AdcFitter.Fit(dwi.Take(2).ToList()));   // b=50 excluded → one b left
        Assert.Throws<InvalidParameterException>(() => AdcFitter.Fit([]));
        var explicitPair = AdcFitter.Fit(dwi.Take(2).ToList(), null, new AdcFitOptions(BValues: [50, 400]));
        Assert.Equal([50.0, 400], explicitPair.BValuesUsed);
    }

    [Fact]
    public void ImagesOnDifferentGridsAreRejected()
    {
        var (dwi, _) = ThreeTissues(0, 1);
        var other = new Volume<float>(Geometry.Axial(new Size3(24, 24, 3), new Vec3(2, 2, 4), Vec3.Zero));
        Assert.Throws<GeometryMismatchException>(() => AdcFitter.Fit([.. dwi, new DwiImage(1000, other)]));
    }

    [Fact]
    public void IceWaterPhantomPassesAtTheWaterValue()
    {
        // Src: water at 0 °C = 1.099e-3 mm²/s (Speedy-Angell law, Holz et al. PCCP 2000; facts.md §2).
        Assert.Equal(1099, DwiPhantomCheck.WaterAdcUm2PerS(0), 1.0);
        // Same law at 20 °C gives 2.02e-3 mm²/s (facts.md §2).
        Assert.Equal(2020, DwiPhantomCheck.WaterAdcUm2PerS(20), 10.0);
        var dwi = IceWaterPhantom.Generate(new Size3(48, 48, 3), new Vec3(1.5, 1.5, 4), [0, 500, 900, 2000], 50, 7, tubes: 2);
        var report = DwiPhantomCheck.Run(dwi);
        Assert.Equal(2, report.Vials.Count);
        Assert.True(report.Pass);
        Assert.All(report.Vials, v => Assert.InRange(v.BiasPercent, -2, 2));
    }

    [Fact]
    public void WarmWaterFailsTheIceWaterCheck()
    {
        // Water at 20 °C (2.02e-3 mm²/s) scanned as if it were the 0 °C phantom must fail.
        var dwi = IceWaterPhantom.Generate(new Size3(40, 40, 2), new Vec3(1.5, 1.5, 4), [0, 500, 900], 80, 9,
            adcUm2PerS: DwiPhantomCheck.WaterAdcUm2PerS(20));
        var report = DwiPhantomCheck.Run(dwi);
        Assert.False(report.Pass);
        Assert.True(report.Vials[0].BiasPercent > 50);
    }
}

public sealed class DwiPhantomRepeatabilityTests
{
    [Fact]
    public void RepeatedScansGiveSmallWcvAndNeedTwoScans()
    {
        var reports = Enumerable.Range(0, 3).Select(seed => DwiPhantomCheck.Run(
            Serimetry.Engine.Phantoms.IceWaterPhantom.Generate(new Size3(40, 40, 2), new Vec3(1.5, 1.5, 4), [0, 500, 900], 50, seed, tubes: 2))).ToList();
        var rep = DwiPhantomRepeatability.Analyse(reports);
        Assert.Equal(2, rep.NSubjects);
        Assert.Equal(3, rep.NRepeats);
        // Only noise differs between the simulated scans: short-term wCV well under 1 % (ice-water phantoms on
        // clinical scanners: intra-exam within 1 %, Malyarenko et al. JMRI 2013; facts.md §2).
        Assert.InRange(rep.WithinSubjectCv!.Value, 1e-5, 0.01);
        Assert.Throws<InvalidParameterException>(() => DwiPhantomRepeatability.Analyse(reports.Take(1).ToList()));
    }
}
