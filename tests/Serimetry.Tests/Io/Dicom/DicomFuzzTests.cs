using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.Dicom;

/// <summary>
/// Mutation fuzzing of the reference corpus (bytes flipped, lengths overwritten, files truncated):
/// every read either succeeds or raises an <see cref="InputException"/>. Seeded, so failures repeat;
/// bounded to about 300 reads.
/// </summary>
public sealed class DicomFuzzTests
{
    public static TheoryData<int> Seeds() => [1, 2, 3, 4];

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Mutated_corpus_files_read_or_fail_cleanly(int seed)
    {
        var rng = new Random(seed * 7919);
        var files = Directory.GetFiles(SharedReference.PathOf("dicom", "files"), "*.dcm").Order(StringComparer.Ordinal).ToArray();
        var failures = new List<string>();
        var index = 0;
        foreach (var path in files)
        {
            var original = File.ReadAllBytes(path);
            for (var m = 0; m < 2; m++, index++)
            {
                var (mutated, how) = Mutate(original, rng);
                var outcome = index % 5 == 0 ? ReadHeaderThenPixels(mutated) : DicomBadInputTests.ReadFully(mutated);
                if (outcome is not null and not InputException)
                    failures.Add($"{Path.GetFileName(path)} {how}: {outcome.GetType().Name}: {outcome.Message}");
            }
        }
        Assert.Empty(failures);
    }

    private static (byte[] Bytes, string How) Mutate(byte[] original, Random rng)
    {
        var b = (byte[])original.Clone();
        // Most structure lives in the first few kilobytes: bias mutations there.
        int Pos() => rng.Next(rng.Next(2) == 0 ? Math.Min(b.Length, 4096) : b.Length);
        switch (rng.Next(4))
        {
            case 0:
                var n = 1 + rng.Next(8);
                for (var i = 0; i < n; i++) b[Pos()] ^= (byte)(1 << rng.Next(8));
                return (b, $"{n} bit flips");
            case 1:
                var cut = rng.Next(b.Length);
                return (b[..cut], $"truncated at {cut}");
            case 2:
                var at = Pos() & ~1;
                if (at + 4 <= b.Length) BitConverter.GetBytes(rng.Next(2) == 0 ? 0xFFFFFFFFu : (uint)rng.Next()).CopyTo(b, at);
                return (b, $"length-like word at {at}");
            default:
                var p = Pos();
                b[p] = (byte)rng.Next(256);
                return (b[..Math.Max(p, rng.Next(b.Length))], $"byte {p} set, then truncated");
        }
    }

    private static Exception? ReadHeaderThenPixels(byte[] bytes)
    {
        var tmp = Path.Combine(Path.GetTempPath(), $"serimetry-fuzz-{Environment.ProcessId}-{Guid.NewGuid():N}.dcm");
        try
        {
            File.WriteAllBytes(tmp, bytes);
            var f = DicomFile.ReadHeader(tmp);
            if (f.HasPixelData && f.Dataset.Contains(DicomTags.Rows))
            {
                var px = f.GetPixelData();
                for (var i = 0; i < px.FrameCount; i++) px.GetStoredValues(i);
            }
            return null;
        }
        catch (Exception ex)
        {
            return ex;
        }
        finally
        {
            File.Delete(tmp);
        }
    }
}
