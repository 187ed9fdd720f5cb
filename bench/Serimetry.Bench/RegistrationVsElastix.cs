using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// Whole-pipeline comparison with elastix (Debian package, the reference registration toolbox): rigid
/// registration of analytic-phantom pairs with known truth, matched settings (levels, shrink factors,
/// samples, iterations, bins, mask, initialisation). Prints per-case TRE and wall time, then the ratio.
/// Usage: registration-vs-elastix [--size 384] [--slices 24] [--cases 1] [--first-seed 301] [--no-elastix];
/// with --deformable, rigid + B-spline instead (<see cref="DeformableVsElastix"/>).
/// </summary>
internal static class RegistrationVsElastix
{
    public static int Run(string[] args)
    {
        int size = Arg(args, "--size", 384), slices = Arg(args, "--slices", 24), cases = Arg(args, "--cases", 1), first = Arg(args, "--first-seed", 301);
        if (args.Contains("--deformable")) return DeformableVsElastix.Run(args, size, slices);
        bool withElastix = !args.Contains("--no-elastix") && ElastixReference.Available;
        var ci = CultureInfo.InvariantCulture;
        var grid = RegistrationPhantom.T2Grid(size, size, slices, 0.6, 3.0);
        var mask = RegistrationPhantom.GlandMask(grid);
        var options = RegistrationOptions.Rigid();
        double ourTime = 0, refTime = 0, ourWorst = 0, refWorst = 0, worstGap = double.NegativeInfinity;
        int ourOver = 0;
        Console.WriteLine($"grid {grid.Size} spacing {grid.SpacingMm} mm; preset rigid; elastix {(withElastix ? "on" : "off")}");
        for (int c = 0; c < cases; c++)
        {
            int seed = first + c;
            var truth = RegistrationPhantom.RandomRigid(seed);
            var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.03, seed, bias: 0.15);
            var m = RegistrationPhantom.Render(grid, truth, PhantomContrast.T2w, 0.03, seed + 5000, bias: 0.15);
            GC.Collect();
            var clock = Stopwatch.StartNew();
            var r = Registrar.Register(f, m, options, mask);
            double t = clock.Elapsed.TotalSeconds;
            double tre = RegistrationPhantom.GlandTre(grid, r.Transform, truth);
            ourTime += t; ourWorst = Math.Max(ourWorst, tre); if (tre > 0.5) ourOver++;
            string line = string.Create(ci, $"seed {seed}: serimetry TRE {tre:F3} mm {t:F2} s (iterations {string.Join("/", r.IterationsPerLevel)})");
            if (withElastix)
            {
                var work = Path.Combine(Path.GetTempPath(), $"serimetry-bench-elastix-{seed}");
                var schedule = new ElastixReference.Schedule(
                    r.Levels.SelectMany(l => new[] { l.FixedShrink.X, l.FixedShrink.Y, l.FixedShrink.Z }).ToArray(),
                    options.Levels.Select(l => l.Samples).ToArray(), options.Levels.Max(l => l.MaxIterations), options.HistogramBins);
                var e = ElastixReference.Run(f, m, MaskOps.DilateBox(mask, options.MaskDilationMm), schedule, work);
                Directory.Delete(work, true);
                double etre = RegistrationPhantom.GlandTre(grid, e.Transform, truth);
                refTime += e.WallSeconds; refWorst = Math.Max(refWorst, etre); worstGap = Math.Max(worstGap, tre - etre);
                line += string.Create(ci, $" | elastix TRE {etre:F3} mm {e.WallSeconds:F2} s");
            }
            Console.WriteLine(line);
        }
        Console.WriteLine(string.Create(ci, $"serimetry: total {ourTime:F2} s, worst TRE {ourWorst:F3} mm, cases over 0.5 mm: {ourOver}/{cases}; peak working set {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576} MB (whole bench process)"));
        if (withElastix)
            Console.WriteLine(string.Create(ci, $"elastix: total {refTime:F2} s, worst TRE {refWorst:F3} mm; time ratio serimetry/elastix {ourTime / refTime:F3}; worst TRE gap (ours − elastix) {worstGap:F3} mm"));
        return 0;
    }

    private static int Arg(string[] args, string name, int fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
    }
}
