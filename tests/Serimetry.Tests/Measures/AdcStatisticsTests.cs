using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Measures.BuiltIn;
using Xunit;

namespace Serimetry.Tests.Measures;

/// <summary>Lesion ADC statistics, percentiles and histogram distances against outside values.</summary>
public class AdcStatisticsTests
{
    private static double Measure(AdcStatistic s, VisitContext ctx)
    {
        var v = new LesionAdcMeasure(s).Measure(ctx);
        Assert.Equal(MeasureStatus.Ok, v.Status);
        return v.Value!.Value;
    }

    [Fact]
    public void IbsiDigitalPhantomIntensityStatistics()
    {
        // Src: IBSI chapter 1 reference values for the digital phantom (shared/reference/ibsi):
        // mean Q4LE 2.15, variance ECT3 3.05, skewness KE2A 1.08, excess kurtosis IPH6 −0.355,
        // median Y12H 1, 10th percentile QG58 1. Published to 3 significant digits: compare to half a unit
        // in the last digit.
        var ctx = IbsiPhantom.Load().Context;
        Assert.Equal(2.15, Measure(AdcStatistic.Mean, ctx), 0.005);
        Assert.Equal(3.05, Math.Pow(Measure(AdcStatistic.Sd, ctx), 2), 0.005);
        Assert.Equal(1.08, Measure(AdcStatistic.Skewness, ctx), 0.005);
        Assert.Equal(-0.355, Measure(AdcStatistic.Kurtosis, ctx), 0.0005);
        Assert.Equal(1, Measure(AdcStatistic.Median, ctx), 1e-12);
        Assert.Equal(1, Measure(AdcStatistic.P10, ctx), 1e-12);
        Assert.Equal("QG58", new LesionAdcMeasure(AdcStatistic.P10).IbsiCode);
    }

    [Fact]
    public void PercentilesFollowHyndmanFanDefinition7()
    {
        // Src: Hyndman & Fan, Am Stat 1996 definition 7 (R's default quantile type), worked by hand for
        // x = 1..10: P10 = 1 + 0.9·1 = 1.9, P25 = 3 + 0.25 = 3.25, P50 = 5.5, P100 = 10.
        float[] x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
        Assert.Equal(1.9, SampleStatistics.Percentile(x, 0.10), 12);
        Assert.Equal(3.25, SampleStatistics.Percentile(x, 0.25), 12);
        Assert.Equal(5.5, SampleStatistics.Percentile(x, 0.5), 12);
        Assert.Equal(10, SampleStatistics.Percentile(x, 1), 12);
        Assert.Equal(1, SampleStatistics.Percentile(x, 0), 12);
    }

    [Fact]
    public void NormalQuantileSampleHasTheNormalMoments()
    {
        // Src: a sample at the normal quantiles Φ⁻¹((i+½)/n) has mean μ, SD ≈ σ, skewness 0, excess kurtosis ≈ 0,
        // 10th percentile ≈ μ − 1.2816σ (standard normal table).
        const int n = 20001;
        const double mu = 1100, sigma = 150;
        var x = new float[n];
        for (int i = 0; i < n; i++)
            x[i] = (float)(mu + sigma * MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, (i + 0.5) / n));
        Assert.Equal(mu, SampleStatistics.Mean(x), 0.01);
        Assert.Equal(sigma, SampleStatistics.PopulationSd(x), 1.5);
        Assert.Equal(0, SampleStatistics.Skewness(x), 0.01);
        Assert.Equal(0, SampleStatistics.ExcessKurtosis(x), 0.05);
        Assert.Equal(mu - 1.2816 * sigma, SampleStatistics.Percentile(x, 0.1), 0.5);
    }

    [Fact]
    public void LesionOnT2wGridIsSampledOnTheAdcGridAndNaNsAreDropped()
    {
        // Src: analytic. ADC is 800 inside a 12 mm sphere and 1600 outside; the lesion (8 mm sphere, on a
        // finer T2w grid) lies ≥ 4 mm inside the low region, so every lesion sample is 800. NaN voxels in
        // the lesion are dropped and counted (NaN policy, docs/measures.md).
        var centre = new Vec3(1, 2, 3);
        var t2 = SyntheticMasks.Centred(new Size3(80, 80, 12), new Vec3(0.5, 0.5, 3), Mat3.Identity, centre);
        var adcGrid = SyntheticMasks.Centred(new Size3(24, 24, 12), new Vec3(2, 2, 3), SyntheticMasks.Rotation(new Vec3(0, 0, 1), 10), centre);
        var adc = SyntheticMasks.Image(adcGrid, p => (p - centre).Norm <= 12 ? 800f : 1600f);
        int nanIndex = adc.LinearIndex(12, 12, 6);
        adc.Voxels[nanIndex] = float.NaN;
        var lesion = SyntheticMasks.Ellipsoid(t2, centre, new Vec3(8, 8, 8));
        var ctx = new VisitContext(1, new DateOnly(2025, 1, 1), new Volume<float>(t2)) { Adc = adc, LesionMask = lesion };
        Assert.Equal(800, Measure(AdcStatistic.Mean, ctx), 9);
        Assert.Equal(800, Measure(AdcStatistic.Median, ctx), 9);
        Assert.Equal(800, Measure(AdcStatistic.P10, ctx), 9);
        Assert.Equal(0, Measure(AdcStatistic.Sd, ctx), 9);
        var v = new LesionAdcMeasure(AdcStatistic.Mean).Measure(ctx);
        Assert.Equal("1", v.Provenance["nonFiniteExcluded"]);
        Assert.Equal("10^-6 mm2/s", v.Unit);
    }

    [Fact]
    public void WassersteinAndKolmogorovSmirnovOnSmallSamples()
    {
        // Src: hand-computed from the definitions (W1 = ∫|F_a − F_b|, D = sup|F_a − F_b|):
        // {0,1,3} vs {5,6,8} is a shift by 5, so W1 = 5 and the supports do not overlap, so D = 1;
        // {1,2,3,4} vs {1,2,3,8}: the CDFs differ by 1/4 on [4, 8), so W1 = 1 and D = 0.25.
        Assert.Equal(5, HistogramDistances.Wasserstein1([0f, 1, 3], [5f, 6, 8]), 12);
        Assert.Equal(1, HistogramDistances.KolmogorovSmirnov([0f, 1, 3], [5f, 6, 8]), 12);
        Assert.Equal(1, HistogramDistances.Wasserstein1([1f, 2, 3, 4], [1f, 2, 3, 8]), 12);
        Assert.Equal(0.25, HistogramDistances.KolmogorovSmirnov([1f, 2, 3, 4], [1f, 2, 3, 8]), 12);
        Assert.Equal(0, HistogramDistances.Wasserstein1([3f, 1, 2], [1f, 2, 3]), 12);
    }

    [Fact]
    public void WassersteinOfShiftedNormalsIsTheShift()
    {
        // Src: W1 between N(μ1, σ) and N(μ2, σ) equals |μ1 − μ2| (location family); sampled at quantiles.
        const int n = 5000;
        var a = new float[n];
        var b = new float[3 * n];
        for (int i = 0; i < n; i++) a[i] = (float)(900 + 100 * MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, (i + 0.5) / n));
        for (int i = 0; i < b.Length; i++) b[i] = (float)(1020 + 100 * MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, (i + 0.5) / b.Length));
        Assert.Equal(120, HistogramDistances.Wasserstein1(a, b), 0.5);
        // KS of two normals shifted by d = 1.2σ: D = 2Φ(0.6) − 1 = 0.4515 (standard normal table).
        Assert.Equal(0.4515, HistogramDistances.KolmogorovSmirnov(a, b), 0.002);
    }
}
