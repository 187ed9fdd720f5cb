using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;

namespace Serimetry.Bench;

/// <summary>
/// ADC fit of a 128x128x24 DWI series at 4 b-values (issue 4's size): mono-exponential signal with Rician-like
/// noise, each method over all b-values ≥ 0 (MinBValue 0, so all four are fitted).
/// </summary>
[SimpleJob(launchCount: 1, warmupCount: 1, iterationCount: 5)]
[MemoryDiagnoser]
public class AdcFitBenchmarks
{
    private IReadOnlyList<DwiImage> _dwi = [];

    [Params(AdcFitMethod.LogLinear, AdcFitMethod.WeightedLogLinear, AdcFitMethod.NonLinear)]
    public AdcFitMethod Method { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var g = Geometry.Axial(new Size3(128, 128, 24), new Vec3(2, 2, 3), Vec3.Zero);
        var rng = new Random(5);
        var adc = new double[g.VoxelCount];
        for (int n = 0; n < adc.Length; n++) adc[n] = 800 + 1000 * rng.NextDouble();
        _dwi = new double[] { 50, 400, 800, 1400 }.Select(b =>
        {
            var v = new Volume<float>(g);
            for (int n = 0; n < adc.Length; n++)
            {
                double s = 1000 * Math.Exp(-b * adc[n] * 1e-6);
                double re = s + 30 * Gauss(rng), im = 30 * Gauss(rng);
                v.Voxels[n] = (float)Math.Sqrt(re * re + im * im);
            }
            return new DwiImage(b, v);
        }).ToList();
    }

    [Benchmark]
    public Volume<float> Fit() => AdcFitter.Fit(_dwi, null, new AdcFitOptions(Method, MinBValue: 0, NoiseSigma: 30)).AdcUm2PerS;

    private static double Gauss(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());
}
