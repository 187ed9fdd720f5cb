using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Bench;

/// <summary>
/// <c>compare-sweep [N] [--demo-size]</c>: N seeded phantom subjects (2 visits, random growth 1.0-2.0, motion up to
/// 8 degrees / 10 mm) through the whole comparison; prints, per subject, measured against true lesion-volume
/// ratio, follow-up Dice against the true lesion, gland and median-ADC ratios (both truly 1), and wall time.
/// </summary>
internal static class CompareSweep
{
    public static int Run(string[] args)
    {
        int n = args.Length > 0 && int.TryParse(args[0], out var v) ? v : 10;
        var root = Directory.CreateTempSubdirectory("serimetry-sweep-").FullName;
        var inv = CultureInfo.InvariantCulture;
        Console.WriteLine("seed,trueRatio,measuredRatio,ratioError,vol0/true,vol1/true,dice,glandRatio,adcMedianRatio,seconds");
        var errors = new List<double>();
        var dices = new List<double>();
        try
        {
            for (int s = 0; s < n; s++)
            {
                int seed = 100 + s;
                double growth = 1.0 + new Random(seed).NextDouble();
                var spec = new PhantomSpec() with { Seed = seed, Visits = 2, GrowthPerVisit = growth, MaxRotateDeg = 8, MaxShiftMm = 10, PsaNgPerMl = [5, 6] };
                var subject = PhantomGenerator.Generate(spec);
                var dir = Path.Combine(root, $"s{seed}");
                PhantomWriter.WriteNifti(dir, subject);
                var clock = Stopwatch.StartNew();
                var result = ComparePipeline.Run(new CompareRequest(Path.Combine(dir, "visit-0"), [Path.Combine(dir, "visit-1")],
                    Path.Combine(dir, "visit-0", "masks", "gland.nii.gz"), Path.Combine(dir, "visit-0", "masks", "lesion.nii.gz"), [],
                    RepeatabilityProfile.LoadDefault(), new ComparisonOptions()));
                double seconds = clock.Elapsed.TotalSeconds;
                double V(int k, string id) => result.Report.Visits[k].Values[id].Value ?? double.NaN;
                double trueRatio = subject.Visits[1].Truth.LesionVolumeMl / subject.Visits[0].Truth.LesionVolumeMl;
                double measured = V(1, "lesion.volume") / V(0, "lesion.volume");
                double dice = MaskOps.Dice(result.Visits[1].Lesion!.Mask, MaskOps.Binarize(subject.Visits[1].LesionMask));
                foreach (var th in new[] { 0.5, 0.75, 0.9, 1.0 })
                {
                    double Med(int k, bool occ) { var vi = result.Visits[k]; var smp = Serimetry.Engine.Measures.LesionAdcSamples.Gather(vi.AdcInT2wFrame, vi.Lesion!.Mask, occ ? vi.Lesion.Occupancy : null, th).Values; return Serimetry.Engine.Measures.SampleStatistics.Percentile(smp, 0.5) + 0 * smp.Length; }
                    int N(int k) => Serimetry.Engine.Measures.LesionAdcSamples.Gather(result.Visits[k].AdcInT2wFrame, result.Visits[k].Lesion!.Mask, result.Visits[k].Lesion!.Occupancy, th).Values.Length;
                    Console.Error.WriteLine(string.Create(inv, $"  th {th}: occ {Med(1, true) / Med(0, true):0.000} ({Med(0, true):0} {Med(1, true):0}; n {N(0)} {N(1)})  bin {Med(1, false) / Med(0, false):0.000}"));
                }
                errors.Add(measured / trueRatio - 1);
                dices.Add(dice);
                Console.WriteLine(string.Join(",", seed, trueRatio.ToString("0.000", inv), measured.ToString("0.000", inv),
                    (measured / trueRatio - 1).ToString("+0.0%;-0.0%", inv),
                    (V(0, "lesion.volume") / subject.Visits[0].Truth.LesionVolumeMl).ToString("0.000", inv),
                    (V(1, "lesion.volume") / subject.Visits[1].Truth.LesionVolumeMl).ToString("0.000", inv), dice.ToString("0.000", inv),
                    (V(1, "gland.volume") / V(0, "gland.volume")).ToString("0.000", inv),
                    (V(1, "lesion.adc.median") / V(0, "lesion.adc.median")).ToString("0.000", inv), seconds.ToString("0.0", inv)));
            }
            Console.WriteLine(string.Create(inv, $"volume-ratio error: mean {errors.Average():+0.0%;-0.0%}, worst {errors.MaxBy(Math.Abs):+0.0%;-0.0%}; Dice min {dices.Min():0.000}"));
            return 0;
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }
}
