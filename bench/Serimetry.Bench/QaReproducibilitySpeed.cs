using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;

namespace Serimetry.Bench;

/// <summary>
/// <c>qa-reproducibility [R]</c>: the phantom QA run of <c>serimetry qa reproducibility --phantom
/// phantoms/qa-reproducibility.json --repeats R</c> (default 20) in process, after an untimed 2-repeat warm-up (JIT) and a
/// 5-repeat reference run in the same process: wall time of each, seconds per repeat and the ratio (a run should scale
/// linearly with repeats), the process's peak working set, and the run's wCV and false-positive rates of key measures.
/// </summary>
internal static class QaReproducibilitySpeed
{
    public static int Run(string[] args)
    {
        int repeats = args.Length > 0 && int.TryParse(args[0], out var r) ? r : 20;
        var spec = PhantomSpec.Load(SpecPath());
        var inv = CultureInfo.InvariantCulture;
        Time(spec, 2);
        double reference = Time(spec, 5).Seconds;
        var (full, report) = Time(spec, repeats);
        Console.WriteLine(string.Create(inv, $"reference  5 repeats: {reference,7:0.00} s ({reference / 5:0.00} s per repeat)"));
        Console.WriteLine(string.Create(inv, $"run {repeats,6} repeats: {full,7:0.00} s ({full / repeats:0.00} s per repeat, {full / repeats / (reference / 5):0.00}x the reference per repeat)"));
        Console.WriteLine(string.Create(inv, $"peak working set {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576.0:0} MB"));
        foreach (var id in new[] { "lesion.volume", "gland.volume", "lesion.diameter.max", "lesion.adc.mean", "lesion.adc.median", "lesion.adc.p10", "lesion.conspicuity.adc" })
        {
            var m = report.Statistics.Measures.FirstOrDefault(x => x.Measure == id);
            var fp = report.FalsePositiveRates.FirstOrDefault(x => x.Measure == id);
            if (m is null || fp is null) continue;
            Console.WriteLine(string.Create(inv, $"{id,-24} wCV {m.WithinSubjectCv:0.0%}  pairs over profile band {fp.ExceedingProfile}/{fp.Pairs}  over own RC {fp.ExceedingOwnRc}/{fp.Pairs}"));
        }
        return 0;
    }

    private static (double Seconds, PhantomReproducibilityReport Report) Time(PhantomSpec spec, int repeats)
    {
        var clock = Stopwatch.StartNew();
        var report = PhantomReproducibility.Run(spec, repeats);
        if (report.Statistics.Measures.Count == 0) throw new InvalidOperationException("the QA run measured nothing");
        return (clock.Elapsed.TotalSeconds, report);
    }

    /// <summary>phantoms/qa-reproducibility.json, found by walking up from the benchmark binaries to the repository.</summary>
    private static string SpecPath()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var path = Path.Combine(d.FullName, "phantoms", "qa-reproducibility.json");
            if (File.Exists(path)) return path;
        }
        throw new FileNotFoundException("phantoms/qa-reproducibility.json not found above " + AppContext.BaseDirectory);
    }
}
