using System.IO.Compression;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.Dicom;

/// <summary>Malformed and hostile input must give a clean <see cref="InputException"/>, never another exception or a hang.</summary>
public sealed class DicomBadInputTests
{
    private static readonly string MrSmall = SharedReference.PathOf("dicom", "files", "MR_small.dcm");

    [Fact]
    public void Truncation_at_many_offsets_fails_cleanly_and_never_reads_short_pixels()
    {
        var bytes = File.ReadAllBytes(MrSmall);
        var full = DicomFile.Read(MrSmall);
        var pixelStart = (int)full.PixelDataLocation!.Offset;
        var pixelEnd = pixelStart + (int)full.PixelDataLocation.Length;
        for (var cut = 0; cut < bytes.Length; cut += cut < 1600 ? 7 : 397)
        {
            var outcome = ReadFully(bytes.AsMemory(0, cut));
            // Common practice: a file cut inside its Pixel Data must never decode as if complete.
            if (cut > pixelStart - 12 && cut < pixelEnd) Assert.IsAssignableFrom<InputException>(outcome);
            else Assert.True(outcome is null or InputException, $"cut at {cut}: {outcome}");
        }
    }

    [Theory]
    [InlineData(0)]
    [InlineData(3)]
    [InlineData(131)]
    [InlineData(1000)]
    public void Garbage_is_not_a_dicom_file(int length)
    {
        var rng = new Random(length + 17);
        var bytes = new byte[length];
        rng.NextBytes(bytes);
        if (length > 0) bytes[0] = 0xAB;
        var ex = Assert.ThrowsAny<InputException>(() => DicomFile.Read(bytes.AsMemory(), source: "garbage.bin"));
        Assert.Equal("garbage.bin", ex.Where);
    }

    [Fact]
    public void Element_length_past_the_end_names_the_element()
    {
        var bytes = DicomBytes.Part10().Text(0x0008, 0x0060, "CS", "MR").Header(0x0010, 0x0010, "PN", 1000)
            .Raw("ABCDEFGH"u8.ToArray()).ToArray();
        var ex = Assert.Throws<InputFormatException>(() => DicomFile.Read(bytes.AsMemory()));
        Assert.Contains("(0010,0010)", ex.Message);
        Assert.Contains("1000", ex.Message);
    }

    [Theory]
    [InlineData(65535, 65535, 1)]
    [InlineData(512, 512, 100000)]
    [InlineData(0, 512, 1)]
    public void Absurd_dimensions_are_refused_before_allocating(int rows, int columns, int frames)
    {
        var bytes = DicomBytes.Part10()
            .Text(0x0028, 0x0008, "IS", frames.ToString(System.Globalization.CultureInfo.InvariantCulture))
            .US(0x0028, 0x0010, (ushort)rows).US(0x0028, 0x0011, (ushort)columns)
            .US(0x0028, 0x0100, 16).US(0x0028, 0x0101, 16).US(0x0028, 0x0102, 15).US(0x0028, 0x0103, 0)
            .Element(0x7FE0, 0x0010, "OW", new byte[64]).ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        Assert.ThrowsAny<InputException>(() => file.GetPixelData());
    }

    [Fact]
    public void Pixel_data_shorter_than_the_image_is_a_format_error()
    {
        var bytes = DicomBytes.Part10().US(0x0028, 0x0010, 8).US(0x0028, 0x0011, 8)
            .US(0x0028, 0x0100, 16).US(0x0028, 0x0101, 12).US(0x0028, 0x0102, 11)
            .Element(0x7FE0, 0x0010, "OW", new byte[100]).ToArray();
        var ex = Assert.Throws<InputFormatException>(() => DicomFile.Read(bytes.AsMemory()).GetPixelData());
        Assert.Contains("128", ex.Message);
    }

    [Fact]
    public void Deeply_nested_sequences_hit_the_depth_limit()
    {
        var b = DicomBytes.Part10();
        for (var i = 0; i < 500; i++) b.Header(0x0040, 0xA730, "SQ", 0xFFFFFFFF).Item(0xE000, 0xFFFFFFFF);
        var ex = Assert.Throws<InputLimitException>(() => DicomFile.Read(b.ToArray().AsMemory()));
        Assert.Contains("64", ex.Message);
    }

    [Fact]
    public void Deflate_bomb_stops_at_the_inflated_size_limit()
    {
        using var packed = new MemoryStream();
        using (var z = new DeflateStream(packed, CompressionLevel.Optimal, true))
        {
            var zeros = new byte[1 << 20];
            for (var i = 0; i < 64; i++) z.Write(zeros);
        }
        var bytes = DicomBytes.Part10("1.2.840.10008.1.2.1.99").Raw(packed.ToArray()).ToArray();
        var options = new DicomReadOptions(MaxInflatedBytes: 4 << 20);
        var ex = Assert.Throws<InputLimitException>(() => DicomFile.Read(bytes.AsMemory(), options));
        Assert.Contains("inflates to more than", ex.Message);
    }

    [Fact]
    public void Corrupt_deflate_stream_is_a_format_error()
    {
        var bytes = DicomBytes.Part10("1.2.840.10008.1.2.1.99").Raw([0xFF, 0xFF, 0xFF, 0xFF, 0x13, 0x37, 0, 1, 2, 3]).ToArray();
        Assert.ThrowsAny<InputException>(() => DicomFile.Read(bytes.AsMemory()));
    }

    [Fact]
    public void Missing_file_is_an_input_error_without_the_full_path()
    {
        var ex = Assert.Throws<InputFormatException>(() => DicomFile.ReadHeader(Path.Combine(Path.GetTempPath(), "no-such-dir-x", "a.dcm")));
        Assert.Equal("a.dcm", ex.Where);
    }

    [Fact]
    public void Header_read_does_not_touch_pixels_and_on_demand_read_reports_truncation()
    {
        var bytes = File.ReadAllBytes(MrSmall);
        var tmp = Path.Combine(Path.GetTempPath(), $"serimetry-trunc-{Environment.ProcessId}.dcm");
        try
        {
            File.WriteAllBytes(tmp, bytes[..(bytes.Length - 4000)]);
            var file = DicomFile.ReadHeader(tmp);
            Assert.Equal("4MR1", file.Dataset.GetString(DicomTags.PatientID));
            Assert.Throws<InputFormatException>(() => file.GetPixelData());
        }
        finally
        {
            File.Delete(tmp);
        }
    }

    /// <summary>Reads and decodes everything; returns null on success or the exception raised.</summary>
    internal static Exception? ReadFully(ReadOnlyMemory<byte> data)
    {
        try
        {
            var f = DicomFile.Read(data, source: "fuzz");
            foreach (var e in f.Dataset.Elements) TouchValue(f.Dataset, e);
            if (f.HasPixelData && f.Dataset.Contains(DicomTags.Rows))
            {
                var px = f.GetPixelData();
                for (var i = 0; i < px.FrameCount; i++) px.GetRescaledValues(i);
            }
            return null;
        }
        catch (Exception ex)
        {
            return ex;
        }
    }

    private static void TouchValue(DicomDataset ds, DicomElement e)
    {
        if (e.Items is { } items)
        {
            foreach (var item in items)
                foreach (var inner in item.Elements) TouchValue(item, inner);
            return;
        }
        if (e.Tag.Group == 0x7FE0) return;
        try
        {
            ds.GetString(e.Tag);
        }
        catch (InputException)
        {
            // an unconvertible value is a clean outcome
        }
    }
}
