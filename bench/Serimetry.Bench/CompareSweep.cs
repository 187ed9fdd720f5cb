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
/// ratio, measured against analytic absolute lesion volume per visit, follow-up Dice against the true lesion, gland and
/// median-ADC ratios (both truly 1), and wall time; then a summary of each.
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
        var absolute = new List<double>();
        var glands = new List<double>();
        var adcs = new List<double>();
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
                errors.Add(measured / trueRatio - 1);
                dices.Add(dice);
                absolute.AddRange([V(0, "lesion.volume") / subject.Visits[0].Truth.LesionVolumeMl, V(1, "lesion.volume") / subject.Visits[1].Truth.LesionVolumeMl]);
                glands.Add(V(1, "gland.volume") / V(0, "gland.volume"));
                adcs.Add(V(1, "lesion.adc.median") / V(0, "lesion.adc.median"));
                Console.WriteLine(string.Join(",", seed, trueRatio.ToString("0.000", inv), measured.ToString("0.000", inv),
                    (Math.Round(measured / trueRatio - 1, 3) + 0.0).ToString("+0.0%;-0.0%;0.0%", inv),
                    (V(0, "lesion.volume") / subject.Visits[0].Truth.LesionVolumeMl).ToString("0.000", inv),
                    (V(1, "lesion.volume") / subject.Visits[1].Truth.LesionVolumeMl).ToString("0.000", inv), dice.ToString("0.000", inv),
                    (V(1, "gland.volume") / V(0, "gland.volume")).ToString("0.000", inv),
                    (V(1, "lesion.adc.median") / V(0, "lesion.adc.median")).ToString("0.000", inv), seconds.ToString("0.0", inv)));
            }
            Console.WriteLine(string.Create(inv, $"volume-ratio error: mean {errors.Average():+0.0%;-0.0%}, worst {errors.MaxBy(Math.Abs):+0.0%;-0.0%}; absolute volume / analytic {absolute.Min():0.000}-{absolute.Max():0.000}"));
            Console.WriteLine(string.Create(inv, $"Dice {dices.Min():0.000}-{dices.Max():0.000}; gland ratio {glands.Min():0.000}-{glands.Max():0.000}"));
            Console.WriteLine(string.Create(inv, $"median-ADC ratio {adcs.Min():0.000}-{adcs.Max():0.000}, RMS error {Math.Sqrt(adcs.Average(x => (x - 1) * (x - 1))):0.0%}, {adcs.Count(x => Math.Abs(x - 1) <= 0.05)}/{adcs.Count} within ±5 %"));
            return 0;
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }
}
