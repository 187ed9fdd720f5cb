using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Radiomics;

namespace Serimetry.Bench;

/// <summary>
/// <c>radiomics-timing [runs]</c>: CPU time of every family on the <see cref="RadiomicsBenchmarks"/> ROI at 32 and 128 bins,
/// best of N runs, with each family's ratio to the full set measured in the same process. CPU time of this
/// single-threaded work is far less disturbed than wall time on a shared, loaded machine.
/// </summary>
internal static class RadiomicsTiming
{
    public static int Run(string[] args)
    {
        int runs = args.Length > 0 ? int.Parse(args[0], CultureInfo.InvariantCulture) : 3;
        var (image, mask) = RadiomicsBenchmarks.Build();
        int roi = mask.Voxels.Count(b => b != 0);
        Console.WriteLine($"ROI {roi:N0} voxels in {image.Size.X}x{image.Size.Y}x{image.Size.Z}; best CPU time of {runs} runs");
        var families = new List<(string Name, FeatureFamily[] Families)> { ("all families", Enum.GetValues<FeatureFamily>()) };
        families.AddRange(Enum.GetValues<FeatureFamily>().Select(f => (f.ToString(), new[] { f })));
        foreach (int bins in new[] { 32, 128 })
        {
            double all = 0;
            foreach (var (name, fam) in families)
            {
                var settings = new RadiomicsSettings
                {
                    Discretisation = new DiscretisationSettings { BinCount = bins },
                    IvhDiscretisation = new DiscretisationSettings { BinCount = 1000 },
                    Families = fam,
                };
                double best = double.MaxValue;
                for (int r = 0; r < runs; r++)
                {
                    var cpu = Process.GetCurrentProcess().TotalProcessorTime;
                    RadiomicsExtractor.Extract(image, mask, settings);
                    best = Math.Min(best, (Process.GetCurrentProcess().TotalProcessorTime - cpu).TotalMilliseconds);
                }
                if (all == 0) all = best;
                Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{bins,4} bins  {name,-26} {best,8:F0} ms  {best / all,6:P0} of all"));
            }
        }
        return 0;
    }
}
