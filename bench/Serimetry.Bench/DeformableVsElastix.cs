using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Registration;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// The <c>deformable</c> preset (rigid + cubic B-spline) against elastix (Debian package, EulerTransform then
/// BSplineTransform, Mattes MI) on a T2w-like pair with a known smooth deformation (10 % gland compression plus a
/// shift, <see cref="DeformedPhantom"/>), matched settings: the same per-axis shrink factors, samples and maximum
/// iterations per level, the same 12 mm control grid and dilated mask. Prints mean displacement error over the gland,
/// wall time, the time ratio and the peak working set of this process (elastix runs as its own process).
/// Usage: registration-vs-elastix --deformable [--size 384] [--slices 24] [--no-elastix]
/// </summary>
internal static class DeformableVsElastix
{
    public static int Run(string[] args, int size, int slices)
    {
        bool withElastix = !args.Contains("--no-elastix") && ElastixReference.Available;
        var ci = CultureInfo.InvariantCulture;
        var grid = RegistrationPhantom.T2Grid(size, size, slices, 0.6, 3.0);
        var truth = new DeformedPhantom(0.10, 1, 25, new Vec3(3, -2, 1.5));
        var f = RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.03, 501);
        var m = truth.Render(grid, 0.03, 502);
        var gland = RegistrationPhantom.GlandMask(grid);
        var options = RegistrationOptions.ForPreset("deformable");
        Console.WriteLine($"grid {grid.Size} spacing {grid.SpacingMm} mm; preset deformable; elastix {(withElastix ? "on" : "off")}");
        long before = Process.GetCurrentProcess().PeakWorkingSet64;
        GC.Collect();
        var clock = Stopwatch.StartNew();
        var r = Registrar.Register(f, m, options, gland);
        double t = clock.Elapsed.TotalSeconds;
        double error = RegistrationPhantom.GlandTre(grid, r.FullTransform, truth);
        double rigidError = RegistrationPhantom.GlandTre(grid, r.Transform, truth);
        Console.WriteLine(string.Create(ci, $"serimetry: error {error:F3} mm (rigid part {rigidError:F3}), {t:F2} s, " +
            $"iterations rigid {string.Join("/", r.IterationsPerLevel)} bspline {string.Join("/", r.DeformationLevels.Select(l => l.Iterations))}; " +
            $"peak working set {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576} MB (whole process; {before / 1048576} MB before registering)"));
        if (!withElastix) return 0;
        var work = Path.Combine(Path.GetTempPath(), $"serimetry-bench-elastix-bspline-{Environment.ProcessId}");
        try
        {
            string Schedule(IEnumerable<LevelReport> levels) => string.Join(" ", levels.SelectMany(l => new[] { l.FixedShrink.X, l.FixedShrink.Y, l.FixedShrink.Z }));
            var e = ElastixBSplineRunner.Run(f, m, MaskOps.DilateBox(gland, options.MaskDilationMm), Schedule(r.Levels), Schedule(r.DeformationLevels),
                options.BSpline!.GridSpacingMm, work,
                string.Join(" ", options.Levels.Select(l => l.Samples)), string.Join(" ", options.BSpline.Levels.Select(l => l.Samples)),
                options.Levels.Max(l => l.MaxIterations), options.BSpline.Levels.Max(l => l.MaxIterations));
            double eError = RegistrationPhantom.GlandTre(grid, e.Transform, truth);
            Console.WriteLine(string.Create(ci, $"elastix: error {eError:F3} mm, {e.WallSeconds:F2} s; time ratio serimetry/elastix {t / e.WallSeconds:F3}"));
        }
        finally
        {
            if (Directory.Exists(work)) Directory.Delete(work, true);
        }
        return 0;
    }
}
