using System.IO.Compression;
using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Xunit;

namespace Serimetry.Tests.Io.Series;

public sealed class StudyIndexTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-index-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    /// <summary>A stand-in reader: a "DICOM" file here is a preamble, DICM, and the series UID as text.</summary>
    private sealed class FakeReader : ISliceHeaderReader
    {
        public int Calls;
        public int LargestInput;

        public SliceReadResult ReadFile(string path) => ReadBytes(File.ReadAllBytes(path), new SliceSource(path));

        public SliceReadResult ReadBytes(byte[] bytes, SliceSource source)
        {
            Interlocked.Increment(ref Calls);
            lock (this) LargestInput = Math.Max(LargestInput, bytes.Length);
            var text = Encoding.ASCII.GetString(bytes, 132, bytes.Length - 132);
            if (text == "no-image") return SliceReadResult.Skip("no image");
            return new SliceReadResult([new SliceHeader { Source = source, SeriesInstanceUid = text }], null);
        }
    }

    private static byte[] FakeDicom(string payload) =>
        [.. new byte[128], .. "DICM"u8.ToArray(), .. Encoding.ASCII.GetBytes(payload)];

    [Fact]
    public void FolderIsIndexedInPathOrderWhateverTheThreadCount()
    {
        for (int i = 0; i < 40; i++)
        {
            var sub = Path.Combine(_dir, $"s{i % 3}");
            Directory.CreateDirectory(sub);
            File.WriteAllBytes(Path.Combine(sub, $"f{i:D3}.dcm"), FakeDicom($"1.2.{i % 3}"));
        }
        File.WriteAllText(Path.Combine(_dir, "README.md"), "not an image");
        var one = StudyIndex.Build(_dir, new FakeReader(), new StudyIndexOptions(MaxDegreeOfParallelism: 1));
        var many = StudyIndex.Build(_dir, new FakeReader(), new StudyIndexOptions(MaxDegreeOfParallelism: 4));
        Assert.Equal(40, one.Slices.Count);
        Assert.Equal(one.Slices.Select(s => s.Source.Container), many.Slices.Select(s => s.Source.Container));
        var sorted = one.Slices.Select(s => s.Source.Container).Order(StringComparer.Ordinal);
        Assert.Equal(sorted, one.Slices.Select(s => s.Source.Container));
        var note = Assert.Single(one.Notes);
        Assert.EndsWith("README.md", note.Where);
        Assert.Contains("not DICOM", note.Reason);
    }

    [Fact]
    public void EmptyFolderIsAClearError()
    {
        var e = Assert.Throws<InputFormatException>(() => StudyIndex.Build(_dir, new FakeReader()));
        Assert.Contains("no files", e.Message);
    }

    [Fact]
    public void FolderWithoutImagesSaysWhy()
    {
        File.WriteAllText(Path.Combine(_dir, "notes.txt"), "hello");
        File.WriteAllBytes(Path.Combine(_dir, "dir.dcm"), FakeDicom("no-image"));
        var e = Assert.Throws<InputFormatException>(() => StudyIndex.Build(_dir, new FakeReader()));
        Assert.Contains("no DICOM images found among 2", e.Message);
        Assert.Contains("no image", e.Message);
    }

    [Fact]
    public void MissingPathIsAClearError() =>
        Assert.Throws<InputFormatException>(() => StudyIndex.Build(Path.Combine(_dir, "nope"), new FakeReader()));

    [Fact]
    public void ZipEntriesAreReadInNameOrder()
    {
        var zip = Path.Combine(_dir, "exam.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
        {
            foreach (var name in new[] { "b/2.dcm", "a/1.dcm", "readme.txt" })
            {
                using var s = a.CreateEntry(name).Open();
                s.Write(name.EndsWith(".txt") ? "text"u8.ToArray() : FakeDicom("1.2." + name[0]));
            }
        }
        var index = StudyIndex.Build(zip, new FakeReader());
        Assert.Equal(["a/1.dcm", "b/2.dcm"], index.Slices.Select(s => s.Source.Entry!));
        Assert.Single(index.Notes);
    }

    [Fact]
    public void ZipBombIsRefusedWithoutInflating()
    {
        // 64 MiB of zeros deflates to about 64 KiB: a ratio near 1000, far above the limit of 100.
        var zip = Path.Combine(_dir, "bomb.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
        {
            using var s = a.CreateEntry("slice.dcm", CompressionLevel.SmallestSize).Open();
            var zeros = new byte[1 << 20];
            for (int i = 0; i < 64; i++) s.Write(zeros);
        }
        Assert.True(new FileInfo(zip).Length < 1 << 20);
        var reader = new FakeReader();
        var e = Assert.Throws<InputLimitException>(() => StudyIndex.Build(zip, reader));
        Assert.Contains("zip bomb", e.Fix);
        Assert.Equal(0, reader.Calls);
    }

    [Fact]
    public void OversizedEntryIsRefused()
    {
        var zip = Path.Combine(_dir, "big.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
        {
            using var s = a.CreateEntry("slice.dcm", CompressionLevel.SmallestSize).Open();
            s.Write(new byte[3 << 20]);
        }
        var limits = new ZipLimits(MaxEntryBytes: 2 << 20, MaxCompressionRatio: 1e9);
        Assert.Throws<InputLimitException>(() => StudyIndex.Build(zip, new FakeReader(), new StudyIndexOptions(Zip: limits)));
    }

    [Fact]
    public void TooManyEntriesAreRefused()
    {
        var zip = Path.Combine(_dir, "many.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
            for (int i = 0; i < 300; i++) a.CreateEntry($"e{i}.dcm");
        var e = Assert.Throws<InputLimitException>(() =>
            StudyIndex.Build(zip, new FakeReader(), new StudyIndexOptions(Zip: new ZipLimits(MaxEntries: 256))));
        Assert.Contains("300 entries", e.Message);
    }

    [Fact]
    public void TotalSizeLimitIsChecked()
    {
        var zip = Path.Combine(_dir, "total.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
            for (int i = 0; i < 4; i++)
            {
                using var s = a.CreateEntry($"e{i}.dcm").Open();
                s.Write(new byte[100_000]);
            }
        Assert.Throws<InputLimitException>(() => StudyIndex.Build(zip, new FakeReader(),
            new StudyIndexOptions(Zip: new ZipLimits(MaxTotalBytes: 300_000))));
    }

    [Fact]
    public void PathTraversalEntryIsRefused()
    {
        var zip = Path.Combine(_dir, "evil.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
        {
            using var s = a.CreateEntry("../../etc/evil.dcm").Open();
            s.Write(FakeDicom("1.2"));
        }
        var e = Assert.Throws<InputFormatException>(() => StudyIndex.Build(zip, new FakeReader()));
        Assert.Contains("path traversal", e.Message);
    }

    [Fact]
    public void BombInsideAFolderIsReportedAsTheLimitNotAsAThreadError()
    {
        for (int i = 0; i < 20; i++) File.WriteAllBytes(Path.Combine(_dir, $"f{i:D2}.dcm"), FakeDicom("1.2"));
        using (var a = ZipFile.Open(Path.Combine(_dir, "z.zip"), ZipArchiveMode.Create))
            for (int i = 0; i < 10; i++) a.CreateEntry($"e{i}");
        Assert.Throws<InputLimitException>(() => StudyIndex.Build(_dir, new FakeReader(),
            new StudyIndexOptions(Zip: new ZipLimits(MaxEntries: 5), MaxDegreeOfParallelism: 4)));
    }

    [Fact]
    public void EntryIsNeverInflatedBeyondItsDeclaredSize()
    {
        // A forged archive: 2 MiB of zeros whose local and central headers claim 1000 bytes uncompressed.
        var zip = Path.Combine(_dir, "forged.zip");
        using (var a = ZipFile.Open(zip, ZipArchiveMode.Create))
        {
            using var s = a.CreateEntry("slice.dcm", CompressionLevel.SmallestSize).Open();
            s.Write(FakeDicom(new string('0', 2 << 20)));
        }
        var bytes = File.ReadAllBytes(zip);
        Patch(bytes, [0x50, 0x4B, 0x03, 0x04], 22);
        Patch(bytes, [0x50, 0x4B, 0x01, 0x02], 24);
        File.WriteAllBytes(zip, bytes);
        var reader = new FakeReader();
        try
        {
            StudyIndex.Build(zip, reader);
        }
        catch (InputException e)
        {
            Assert.True(e is InputLimitException or InputFormatException, e.GetType().Name);
        }
        // Refused, or cut at the declared 1000 bytes: never the 2 MiB the forged entry really holds.
        Assert.InRange(reader.LargestInput, 0, 1000);
    }

    /// <summary>Writes 1000 as the uncompressed size at <paramref name="offset"/> after the first record with this signature.</summary>
    private static void Patch(byte[] bytes, byte[] signature, int offset)
    {
        int at = bytes.AsSpan().IndexOf(signature);
        Assert.True(at >= 0);
        BitConverter.TryWriteBytes(bytes.AsSpan(at + offset, 4), 1000u);
    }

    private sealed class Recorder : IProgress<(int Done, int Total)>
    {
        public readonly List<(int, int)> Reports = [];

        public void Report((int Done, int Total) value)
        {
            lock (Reports) Reports.Add(value);
        }
    }

    [Fact]
    public void ProgressEndsWithAllFilesDone()
    {
        for (int i = 0; i < 70; i++) File.WriteAllBytes(Path.Combine(_dir, $"f{i:D3}.dcm"), FakeDicom("1.2"));
        var rec = new Recorder();
        StudyIndex.Build(_dir, new FakeReader(), new StudyIndexOptions(MaxDegreeOfParallelism: 2, Progress: rec));
        Assert.Contains((70, 70), rec.Reports);
        Assert.All(rec.Reports, r => Assert.InRange(r.Item1, 1, 70));
    }
}
