using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.Dicom;

/// <summary>Value converters, character sets, dictionary and parser edge cases.</summary>
public sealed class DicomDatasetTests
{
    [Fact]
    public void Converters_follow_the_value_representations()
    {
        // Src: PS3.5 6.2 (DS/IS text with backslash-separated values and space padding; binary US/SS/FD little endian).
        var bytes = DicomBytes.Part10()
            .Text(0x0018, 0x0050, "DS", " 2.5 ")
            .Text(0x0020, 0x0032, "DS", "-83.9063\\-91.2\\6.6406")
            .Text(0x0020, 0x0013, "IS", "12")
            .US(0x0028, 0x0010, 64, 65535)
            .Element(0x0028, 0x0106, "SS", BitConverter.GetBytes((short)-5))
            .Element(0x0018, 0x9087, "FD", BitConverter.GetBytes(800.0))
            .Element(0x0020, 0x9165, "AT", [0x20, 0x00, 0x32, 0x00])
            .ToArray();
        var ds = DicomFile.Read(bytes.AsMemory()).Dataset;
        Assert.Equal(2.5, ds.GetDouble(DicomTags.SliceThickness));
        Assert.Equal([-83.9063, -91.2, 6.6406], ds.GetDoubles(DicomTags.ImagePositionPatient));
        Assert.Equal("-91.2", ds.GetString(DicomTags.ImagePositionPatient, 1));
        Assert.Equal(12, ds.GetInt(DicomTags.InstanceNumber));
        Assert.Equal([64, 65535], ds.GetInts(DicomTags.Rows));
        Assert.Equal(-5, ds.GetInt(new DicomTag(0x0028, 0x0106)));
        Assert.Equal(800.0, ds.GetDouble(DicomTags.DiffusionBValue));
        Assert.Equal("(0020,0032)", ds.GetString(new DicomTag(0x0020, 0x9165)));
        Assert.False(ds.Contains(DicomTags.PatientName));
        Assert.Null(ds.GetStringOrNull(DicomTags.PatientName));
        var ex = Assert.Throws<InputFormatException>(() => ds.GetString(DicomTags.PatientName));
        Assert.Contains("PatientName", ex.Message);
    }

    [Theory]
    [InlineData("ISO_IR 100", "Müller^Renée")]
    [InlineData("ISO_IR 192", "Müller^Renée^東京")]
    [InlineData("ISO_IR 144", "Иванов^Пётр")]
    public void Names_decode_in_their_specific_character_set(string charset, string name)
    {
        // Src: PS3.3 C.12.1.1.2 (defined terms) and PS3.5 annex H/I examples; code pages from ISO 8859 (common practice).
        var encoding = charset switch
        {
            "ISO_IR 192" => Encoding.UTF8,
            "ISO_IR 144" => CodePagesEncodingProvider.Instance.GetEncoding(28595)!,
            _ => Encoding.Latin1,
        };
        var bytes = DicomBytes.Part10().Text(0x0008, 0x0005, "CS", charset)
            .Element(0x0010, 0x0010, "PN", DicomBytes.Pad(encoding.GetBytes(name), (byte)' ')).ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        Assert.Equal(name, file.Dataset.GetString(DicomTags.PatientName));
        Assert.Empty(file.Leniencies);
    }

    [Fact]
    public void Unknown_character_set_falls_back_to_latin1_as_a_recorded_leniency()
    {
        var bytes = DicomBytes.Part10().Text(0x0008, 0x0005, "CS", "ISO_IR 999")
            .Element(0x0010, 0x0010, "PN", DicomBytes.Pad(Encoding.Latin1.GetBytes("Zoë"), (byte)' ')).ToArray();
        var file = DicomFile.Read(bytes.AsMemory());
        Assert.Equal("Zoë", file.Dataset.GetString(DicomTags.PatientName));
        Assert.Contains(file.Leniencies, l => l.Contains("ISO_IR 999", StringComparison.Ordinal));
        var strict = DicomFile.Read(bytes.AsMemory(), new DicomReadOptions(Strict: true));
        Assert.Throws<InputFormatException>(() => strict.Dataset.GetString(DicomTags.PatientName));
    }

    [Fact]
    public void Dictionary_matches_ps3_6_entries_including_repeating_groups()
    {
        // Src: PS3.6 table 6-1 (via dcmtk dicom.dic).
        Assert.Equal("PatientID", new DicomTag(0x0010, 0x0020).Keyword);
        Assert.Equal(DicomVR.LO, DicomDictionary.Lookup(new DicomTag(0x0010, 0x0020))!.VR);
        Assert.Equal(DicomVR.SQ, DicomDictionary.Lookup(DicomTags.PerFrameFunctionalGroupsSequence)!.VR);
        Assert.Equal("OverlayData", new DicomTag(0x6002, 0x3000).Keyword);
        Assert.Null(new DicomTag(0x6001, 0x3000).Keyword);
        Assert.Equal(DicomVR.UL, DicomParser.ImplicitVR(new DicomTag(0x0009, 0x0000)));
        Assert.Equal(DicomVR.LO, DicomParser.ImplicitVR(new DicomTag(0x0019, 0x0010)));
        Assert.Equal(DicomVR.UN, DicomParser.ImplicitVR(new DicomTag(0x0019, 0x100C)));
        Assert.True(DicomDictionary.TryFindKeyword("ImagePositionPatient", out var ipp));
        Assert.Equal(new DicomTag(0x0020, 0x0032), ipp);
    }

    [Fact]
    public void Un_of_undefined_length_is_read_as_an_implicit_sequence()
    {
        // Src: dcmtk `dcmdump UN_sequence.dcm` shows (4453,100C) > item > (0008,1115) > item > (0020,000E); PS3.5 6.2.2.
        var ds = DicomFile.Read(SharedReference.PathOf("dicom", "files", "UN_sequence.dcm")).Dataset;
        var un = ds.Get(new DicomTag(0x4453, 0x100C));
        Assert.Equal(DicomVR.SQ, un.VR); // dcmdump also reports SQ
        var item = Assert.Single(un.Items!);
        var series = Assert.Single(item.GetSequence(DicomTags.ReferencedSeriesSequence));
        Assert.Equal("1.2.840.113619.2.327.3.185221411.476.1398588726.276", series.GetString(DicomTags.SeriesInstanceUID));
        Assert.Equal("1.2.840.113619.2.327.3.185221411.476.1398588725.795", item.GetString(DicomTags.StudyInstanceUID));
    }

    [Fact]
    public void Odd_length_is_a_leniency_and_an_error_when_strict()
    {
        // Src: dcmtk `dcmdump nested_priv_SQ.dcm` reports (0001,0002) with odd length 9 (shown padded to 10).
        var path = SharedReference.PathOf("dicom", "files", "nested_priv_SQ.dcm");
        var lenient = DicomFile.Read(path);
        Assert.Contains(lenient.Leniencies, l => l.Contains("odd length", StringComparison.Ordinal));
        var outer = Assert.Single(lenient.Dataset.GetSequence(new DicomTag(0x0001, 0x0001)));
        Assert.Single(outer.GetSequence(new DicomTag(0x0001, 0x0001)));
        Assert.Throws<InputFormatException>(() => DicomFile.Read(path, new DicomReadOptions(Strict: true)));
    }

    [Fact]
    public void Stored_values_mask_high_bits_and_sign_extend()
    {
        // Src: PS3.5 8.1.1 and annex D (Bits Stored 12, High Bit 11; bits above High Bit are not part of the value).
        // 4x4 pixels so that both the vectorised path (8 at a time) and the scalar tail are exercised.
        ushort[] pattern = [0xF800, 0x07FF, 0x0FFF, 0xA123, 0x0000, 0x8800, 0x1001, 0x0FFE];
        ushort[] raw = [.. pattern, .. pattern[..7], 0xF800];
        var bytes = DicomBytes.Part10().US(0x0028, 0x0002, 1).Text(0x0028, 0x0004, "CS", "MONOCHROME2")
            .US(0x0028, 0x0010, 4).US(0x0028, 0x0011, 4)
            .US(0x0028, 0x0100, 16).US(0x0028, 0x0101, 12).US(0x0028, 0x0102, 11).US(0x0028, 0x0103, 1)
            .Text(0x0028, 0x1052, "DS", "-10").Text(0x0028, 0x1053, "DS", "2")
            .Element(0x7FE0, 0x0010, "OW", raw.SelectMany(BitConverter.GetBytes).ToArray()).ToArray();
        var px = DicomFile.Read(bytes.AsMemory()).GetPixelData();
        int[] expected = [-2048, 2047, -1, 0x123, 0, -2048, 1, -2];
        Assert.Equal([.. expected, .. expected[..7], -2048], px.GetStoredValues(0));
        Assert.Equal([-4106f, 4084f, -12f, 572f], px.GetRescaledValues(0)[..4]);
    }

    [Fact]
    public void Encapsulated_frames_are_split_by_offset_table_or_one_fragment_per_frame()
    {
        // Src: PS3.5 A.4 (Basic Offset Table offsets count from the first fragment's Item tag); frames in
        // Encapsulated Uncompressed Explicit VR Little Endian (PS3.5 A.4.11) are raw bytes.
        byte[][] frames = [[1, 2, 3, 4], [5, 6, 7, 8], [9, 10, 11, 12]];
        foreach (var withTable in new[] { true, false })
        {
            var b = DicomBytes.Part10("1.2.840.10008.1.2.1.98").US(0x0028, 0x0010, 2).US(0x0028, 0x0011, 2)
                .Text(0x0028, 0x0008, "IS", "3").US(0x0028, 0x0100, 8).US(0x0028, 0x0101, 8).US(0x0028, 0x0102, 7)
                .Header(0x7FE0, 0x0010, "OB", 0xFFFFFFFF);
            if (withTable) b.Item(0xE000, 12).Raw([.. BitConverter.GetBytes(0u), .. BitConverter.GetBytes(12u), .. BitConverter.GetBytes(24u)]);
            else b.Item(0xE000, 0);
            foreach (var f in frames) b.Item(0xE000, 4).Raw(f);
            b.Item(0xE0DD, 0);
            var px = DicomFile.Read(b.ToArray().AsMemory()).GetPixelData();
            Assert.True(px.IsEncapsulated);
            for (var i = 0; i < 3; i++) Assert.Equal(frames[i].Select(v => (int)v), px.GetStoredValues(i));
        }
    }

    [Fact]
    public void Without_offset_table_fragments_are_grouped_at_jpeg_end_of_image_markers()
    {
        // Src: PS3.5 A.4 (a frame may span fragments) and ITU-T T.81 B.1.1.3 (EOI marker FFD9 ends an image).
        var b = DicomBytes.Part10("1.2.840.10008.1.2.1.98").US(0x0028, 0x0010, 2).US(0x0028, 0x0011, 2)
            .Text(0x0028, 0x0008, "IS", "3").US(0x0028, 0x0100, 8).US(0x0028, 0x0101, 8).US(0x0028, 0x0102, 7)
            .Header(0x7FE0, 0x0010, "OB", 0xFFFFFFFF).Item(0xE000, 0);
        for (byte f = 0; f < 3; f++) b.Item(0xE000, 2).Raw([f, (byte)(f + 10)]).Item(0xE000, 2).Raw([0xFF, 0xD9]);
        b.Item(0xE0DD, 0);
        var px = DicomFile.Read(b.ToArray().AsMemory()).GetPixelData();
        for (var f = 0; f < 3; f++) Assert.Equal([f, f + 10, 0xFF, 0xD9], px.GetStoredValues(f));
    }

    [Fact]
    public void Lossy_and_unregistered_syntaxes_name_the_syntax_and_the_fix()
    {
        var bytes = DicomBytes.Part10("1.2.840.10008.1.2.4.50").US(0x0028, 0x0010, 2).US(0x0028, 0x0011, 2)
            .US(0x0028, 0x0100, 8).US(0x0028, 0x0101, 8).US(0x0028, 0x0102, 7)
            .Header(0x7FE0, 0x0010, "OB", 0xFFFFFFFF).Item(0xE000, 0).Item(0xE000, 4).Raw([0xFF, 0xD8, 0xFF, 0xD9]).Item(0xE0DD, 0).ToArray();
        var ex = Assert.Throws<UnsupportedInputException>(() => DicomFile.Read(bytes.AsMemory()).GetPixelData());
        Assert.Contains("1.2.840.10008.1.2.4.50", ex.Message);
        Assert.Contains("JPEG Baseline", ex.Message);
        Assert.Contains("lossy", ex.Message);
        Assert.Contains("Explicit VR Little Endian", ex.Fix);
    }
}
