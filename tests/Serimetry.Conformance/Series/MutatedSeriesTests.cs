using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Series;

/// <summary>
/// Damaged copies of the oblique series (bytes overwritten, files cut short): indexing, assembly and volume
/// building either work or fail with an <see cref="InputException"/> — never another exception, never a hang.
/// </summary>
public class MutatedSeriesTests
{
    private static readonly string[] Files = Directory.GetFiles(SharedReference.PathOf("dicom", "series-oblique"), "*.dcm").Order().ToArray();

    [Property(MaxTest = 40)]
    public bool DamagedSeriesFailsCleanly(int seed)
    {
        var rng = new Random(seed);
        var dir = Directory.CreateTempSubdirectory("serimetry-mutate-").FullName;
        try
        {
            foreach (var f in Files.Take(4))
            {
                var bytes = File.ReadAllBytes(f);
                int mode = rng.Next(3);
                if (mode == 0) bytes = bytes[..rng.Next(bytes.Length)];
                else
                    for (int i = 0; i < 1 + rng.Next(8); i++) bytes[rng.Next(Math.Min(bytes.Length, mode == 1 ? 1200 : bytes.Length))] = (byte)rng.Next(256);
                File.WriteAllBytes(Path.Combine(dir, Path.GetFileName(f)), bytes);
            }
            try
            {
                var index = StudyIndex.Build(dir, DicomSliceHeaderReader.Default, new StudyIndexOptions(MaxDegreeOfParallelism: 1));
                foreach (var series in index.Assemble().SelectMany(s => s.Series))
                    foreach (var stack in series.Stacks.Where(s => s.IsRegular))
                        StackVolumeBuilder.Build(stack, maxDegreeOfParallelism: 1);
                InspectReport.From(index).ToJson();
            }
            catch (InputException)
            {
            }
            return true;
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }
}
