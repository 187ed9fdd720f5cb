using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Bench;

/// <summary>
/// <c>compare-speed</c>: one 3-visit comparison at clinical size (T2w 384x384x24 at 0.5x0.5x3 mm, ADC 128x128x24 at
/// 1.5x1.5x3 mm) end to end, with the wall time of each pipeline stage (from the progress reports), the output
/// writing, and the process's peak working set.
/// </summary>
internal static class CompareSpeed
{
    public static int Run(string[] args)
    {
        var root = Directory.CreateTempSubdirectory("serimetry-speed-").FullName;
        try
        {
            var spec = new PhantomSpec() with
            {
                T2Grid = new PhantomGrid(384, 384, 24, 0.5, 0.5, 3.0),
                DwiGrid = new PhantomGrid(128, 128, 24, 1.5, 1.5, 3.0),
            };
            PhantomWriter.WriteNifti(root, PhantomGenerator.Generate(spec));
            string V(int k) => Path.Combine(root, $"visit-{k}");
            var request = new CompareRequest(V(0), [V(1), V(2)], Path.Combine(V(0), "masks", "gland.nii.gz"),
                Path.Combine(V(0), "masks", "lesion.nii.gz"), [], RepeatabilityProfile.LoadDefault(),
                new ComparisonOptions(Radiomics: args.Contains("--no-radiomics") ? null : new RadiomicsSettings()));
            var clock = Stopwatch.StartNew();
            var stages = new List<(string Stage, double Start)>();
            var result = ComparePipeline.Run(request, new Recorder(p => stages.Add((p.Stage, clock.Elapsed.TotalSeconds))));
            double pipeline = clock.Elapsed.TotalSeconds;
            CompareOutputs.Write(result, Path.Combine(root, "out"));
            double total = clock.Elapsed.TotalSeconds;
            var inv = CultureInfo.InvariantCulture;
            for (int i = 0; i < stages.Count; i++)
            {
                double end = i + 1 < stages.Count ? stages[i + 1].Start : pipeline;
                Console.WriteLine(string.Create(inv, $"{stages[i].Stage,-28} {end - stages[i].Start,7:0.00} s"));
            }
            Console.WriteLine(string.Create(inv, $"{"writing outputs",-28} {total - pipeline,7:0.00} s"));
            Console.WriteLine(string.Create(inv, $"{"total",-28} {total,7:0.00} s; peak working set {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576.0:0} MB"));
            return 0;
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }

    private sealed class Recorder(Action<CompareProgress> report) : IProgress<CompareProgress>
    {
        public void Report(CompareProgress value) => report(value);
    }
}
