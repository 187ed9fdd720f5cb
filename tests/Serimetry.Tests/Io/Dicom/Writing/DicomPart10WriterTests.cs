using System.Buffers.Binary;
using System.Text;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Writing;

public sealed class DicomPart10WriterTests
{
    private static DicomWriteDataset Sample() => new DicomWriteDataset()
        .Add(DicomTags.SOPClassUID, DicomVR.UI, "1.2.840.10008.5.1.4.1.1.4")
        .Add(DicomTags.SOPInstanceUID, DicomVR.UI, "1.2.3.456") // odd length: NUL padded
        .Add(DicomTags.PatientName, DicomVR.PN, "Müller^Jürgen")
        .Add(DicomTags.PatientID, DicomVR.LO, "ABC") // odd length: space padded
        .Add(DicomTags.ImageType, DicomVR.CS, "DERIVED", "PRIMARY")
        .Add(DicomTags.PixelSpacing, DicomVR.DS, 0.6, 0.625)
        .Add(DicomTags.InstanceNumber, DicomVR.IS, 7)
        .Add(DicomTags.Rows, DicomVR.US, 512)
        .Add(DicomTags.DiffusionBValue, DicomVR.FD, 1400)
        .AddSequence(DicomTags.ReferencedSeriesSequence,
            new DicomWriteDataset().Add(DicomTags.SeriesInstanceUID, DicomVR.UI, "1.2.3")
                .AddSequence(DicomTags.ReferencedInstanceSequence,
                    new DicomWriteDataset().Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, "1.2.3.4"),
                    new DicomWriteDataset().Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, "1.2.3.5")));

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Written_file_reads_back_with_every_value(bool undefinedLengths)
    {
        // Src: PS3.10 7.1 (preamble, DICM, group 0002), PS3.5 7.5 (sequences of defined and undefined length).
        var bytes = DicomPart10Writer.ToBytes(Sample(), new DicomWriteOptions(undefinedLengths));
        var file = DicomFile.Read(bytes, new DicomReadOptions(Strict: true));
        Assert.Empty(file.Leniencies);
        Assert.Equal(DicomPart10Writer.ExplicitVrLittleEndian, file.TransferSyntaxUid);
        var ds = file.Dataset;
        Assert.Equal("Müller^Jürgen", ds.GetString(DicomTags.PatientName));
        Assert.Equal("ABC", ds.GetString(DicomTags.PatientID));
        Assert.Equal("1.2.3.456", ds.GetString(DicomTags.SOPInstanceUID));
        Assert.Equal(["DERIVED", "PRIMARY"], ds.GetStrings(DicomTags.ImageType));
        Assert.Equal([0.6, 0.625], ds.GetDoubles(DicomTags.PixelSpacing));
        Assert.Equal(7, ds.GetInt(DicomTags.InstanceNumber));
        Assert.Equal(512, ds.GetInt(DicomTags.Rows));
        Assert.Equal(1400, ds.GetDouble(DicomTags.DiffusionBValue));
        var series = Assert.Single(ds.GetSequence(DicomTags.ReferencedSeriesSequence));
        Assert.Equal(["1.2.3.4", "1.2.3.5"], series.GetSequence(DicomTags.ReferencedInstanceSequence)
            .Select(i => i.GetString(DicomTags.ReferencedSOPInstanceUID)));
        Assert.Equal(undefinedLengths, ds.Get(DicomTags.ReferencedSeriesSequence).UndefinedLength);
        Assert.Equal("1.2.3.456", file.FileMeta.GetString(DicomTags.MediaStorageSOPInstanceUID));
        Assert.Equal(DicomUids.ImplementationClassUid, file.FileMeta.GetString(DicomTags.ImplementationClassUID));
        Assert.Equal("ISO_IR 192", ds.GetString(DicomTags.SpecificCharacterSet));
    }

    [Fact]
    public void Preamble_group_length_and_padding_follow_the_standard()
    {
        var bytes = DicomPart10Writer.ToBytes(Sample());
        // Src: PS3.10 7.1: 128-byte preamble then "DICM"; (0002,0000) UL counts the bytes of group 2 after it.
        Assert.All(bytes[..128], b => Assert.Equal(0, b));
        Assert.Equal("DICM", Encoding.ASCII.GetString(bytes, 128, 4));
        Assert.Equal([0x02, 0x00, 0x00, 0x00, (byte)'U', (byte)'L', 4, 0], bytes[132..140]);
        uint groupLength = BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(140));
        int dataStart = 144 + (int)groupLength;
        Assert.Equal(0x0008, BinaryPrimitives.ReadUInt16LittleEndian(bytes.AsSpan(dataStart))); // first data set element
        Assert.NotEqual(0x0002, BinaryPrimitives.ReadUInt16LittleEndian(bytes.AsSpan(dataStart)));
        // Src: PS3.5 6.2: even lengths; UI padded with NUL, other text with a space.
        Assert.Contains(Pattern("1.2.3.456\0"), Windows(bytes));
        Assert.Contains(Pattern("ABC "), Windows(bytes));
        var file = DicomFile.Read(bytes);
        foreach (var e in file.Dataset.Elements) Assert.Equal(0, e.Value.Length % 2);
    }

    [Fact]
    public void Decimal_strings_fit_sixteen_characters()
    {
        // Src: PS3.5 table 6.2-1: DS at most 16 bytes.
        foreach (var v in new[] { Math.PI * 1e-7, -123456.789012345, 1.0 / 3, 6.02214076e23, -0.000123456789 })
        {
            var s = DicomWriteDataset.FormatDecimal(v);
            Assert.InRange(s.Length, 1, 16);
            Assert.Equal(v, double.Parse(s, System.Globalization.CultureInfo.InvariantCulture), Math.Abs(v) * 1e-9);
        }
    }

    [Fact]
    public void Missing_sop_uids_are_refused()
    {
        var ds = new DicomWriteDataset().Add(DicomTags.PatientID, DicomVR.LO, "X");
        Assert.Throws<ArgumentException>(() => DicomPart10Writer.ToBytes(ds));
        Assert.Throws<ArgumentException>(() => ds.Add(DicomTags.TransferSyntaxUID, DicomVR.UI, "1.2"));
    }

    private static string Pattern(string s) => Convert.ToHexString(Encoding.UTF8.GetBytes(s));

    private static string Windows(byte[] b) => Convert.ToHexString(b);
}
