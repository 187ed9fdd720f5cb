using System.IO.Compression;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Xunit;

namespace Serimetry.Tests.Io.Dicom;

/// <summary>Deviations the lenient reader accepts and records, and that strict reading refuses.</summary>
public sealed class DicomLeniencyTests
{
    [Fact]
    public void Deflated_data_with_a_zlib_header_is_read_leniently()
    {
        // Src: PS3.5 A.5 requires raw deflate (RFC 1951); a zlib wrapper (RFC 1950) is a known writer error.
        var dataset = new DicomBytes().Text(0x0008, 0x0060, "CS", "MR").Text(0x0010, 0x0020, "LO", "ID7").ToArray();
        using var packed = new MemoryStream();
        using (var z = new ZLibStream(packed, CompressionLevel.Optimal, true)) z.Write(dataset);
        var bytes = DicomBytes.Part10("1.2.840.10008.1.2.1.99").Raw(packed.ToArray()).ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        Assert.Equal("ID7", file.Dataset.GetString(DicomTags.PatientID));
        Assert.Contains(file.Leniencies, l => l.Contains("zlib", StringComparison.Ordinal));
        Assert.Throws<InputFormatException>(() => DicomFile.Read(bytes.AsMemory(), new DicomReadOptions(Strict: true)));
    }

    [Fact]
    public void Raw_deflate_reads_without_leniency()
    {
        var dataset = new DicomBytes().Text(0x0008, 0x0060, "CS", "MR").Text(0x0010, 0x0020, "LO", "ID7").ToArray();
        using var packed = new MemoryStream();
        using (var z = new DeflateStream(packed, CompressionLevel.Optimal, true)) z.Write(dataset);
        var bytes = DicomBytes.Part10("1.2.840.10008.1.2.1.99").Raw(packed.ToArray()).ToArray();
        var file = DicomFile.Read(bytes.AsMemory(), new DicomReadOptions(Strict: true));
        Assert.Equal("MR", file.Dataset.GetString(DicomTags.Modality));
        Assert.Empty(file.Leniencies);
    }

    [Fact]
    public void Implicit_data_set_under_an_explicit_transfer_syntax_is_detected()
    {
        // Implicit VR LE element: tag, 32-bit length, value (PS3.5 7.1.3).
        var implicitElement = new byte[] { 0x10, 0x00, 0x20, 0x00, 4, 0, 0, 0, (byte)'A', (byte)'B', (byte)'C', (byte)'D' };
        var bytes = DicomBytes.Part10().Raw(implicitElement).ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        Assert.Equal("ABCD", file.Dataset.GetString(DicomTags.PatientID));
        Assert.Contains(file.Leniencies, l => l.Contains("Implicit VR", StringComparison.Ordinal));
    }

    [Fact]
    public void Missing_sequence_delimiter_at_end_of_data_is_a_leniency()
    {
        var bytes = DicomBytes.Part10().Header(0x0008, 0x1115, "SQ", 0xFFFFFFFF).Item(0xE000, 0xFFFFFFFF)
            .Text(0x0020, 0x000E, "UI", "1.2.3").ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        var item = Assert.Single(file.Dataset.GetSequence(DicomTags.ReferencedSeriesSequence));
        Assert.Equal("1.2.3", item.GetString(DicomTags.SeriesInstanceUID));
        Assert.NotEmpty(file.Leniencies);
        Assert.Throws<InputFormatException>(() => DicomFile.Read(bytes.AsMemory(), new DicomReadOptions(Strict: true)));
    }
    [Fact]
    public void Stream_memory_and_file_reads_agree()
    {
        var path = Serimetry.Tests.Shared.SharedReference.PathOf("dicom", "files", "MR_small_bigendian.dcm");
        using var fs = File.OpenRead(path);
        var fromStream = DicomFile.Read(fs, source: "s.dcm");
        var fromMemory = DicomFile.Read(File.ReadAllBytes(path).AsMemory());
        var fromFile = DicomFile.ReadHeader(path);
        Assert.Equal("s.dcm", fromStream.Source);
        Assert.Equal(fromFile.GetPixelData().GetStoredValues(0), fromStream.GetPixelData().GetStoredValues(0));
        Assert.Equal(fromFile.GetPixelData().GetStoredValues(0), fromMemory.GetPixelData().GetStoredValues(0));
        Assert.Equal(fromFile.Dataset.GetString(DicomTags.SeriesInstanceUID), fromStream.Dataset.GetString(DicomTags.SeriesInstanceUID));
    }
}
