using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.DicomWeb;
using Xunit;

namespace Serimetry.Tests.Io.DicomWeb;

/// <summary>The DICOM JSON Model reader against PS3.18 annex F.2 (attribute objects, PN component groups, IS as numbers, sequences).</summary>
public sealed class DicomJsonDatasetTests
{
    private const string Study = """
        [{
          "0020000D": {"vr": "UI", "Value": ["1.2.392.200036.9116.2.2.2.1762893313.1029997326.945873"]},
          "00100010": {"vr": "PN", "Value": [{"Alphabetic": "PHANTOM^NSC-0007", "Phonetic": "other group"}]},
          "00201206": {"vr": "IS", "Value": [3]},
          "00201208": {"vr": "IS", "Value": ["12"]},
          "00080061": {"vr": "CS", "Value": ["MR", "SEG"]},
          "00080050": {"vr": "SH"},
          "00081199": {"vr": "SQ", "Value": [{"00081155": {"vr": "UI", "Value": ["1.2.3"]}}, {"00081155": {"vr": "UI", "Value": ["1.2.4"]}}]},
          "7FE00010": {"vr": "OW", "BulkDataURI": "http://example/bulk"}
        }]
        """;

    [Fact]
    public void ReadsTheAttributeShapesOfAnnexF2()
    {
        var ds = Assert.Single(DicomJsonDataset.ParseArray(Encoding.UTF8.GetBytes(Study), "test"));
        Assert.Equal("1.2.392.200036.9116.2.2.2.1762893313.1029997326.945873", ds.GetString(DicomTags.StudyInstanceUID));
        Assert.Equal("PHANTOM^NSC-0007", ds.GetString(DicomTags.PatientName)); // F.2.2: the Alphabetic component group
        Assert.Equal(3, ds.GetInteger(DicomTags.NumberOfStudyRelatedSeries)); // F.2.3: IS may be a JSON number
        Assert.Equal(12, ds.GetInteger(DicomTags.NumberOfStudyRelatedInstances)); // … or a string
        Assert.Equal(["MR", "SEG"], ds.GetStrings(DicomTags.ModalitiesInStudy));
        Assert.True(ds.Contains(DicomTags.AccessionNumber)); // F.2.5: an empty attribute has no "Value"
        Assert.Null(ds.GetString(DicomTags.AccessionNumber));
        Assert.Equal(["1.2.3", "1.2.4"], ds.GetSequence(DicomTags.ReferencedSOPSequence).Select(i => i.GetString(DicomTags.ReferencedSOPInstanceUID)));
        Assert.Equal("OW", ds.VrOf(new DicomTag(0x7FE0, 0x0010)));
    }

    [Fact]
    public void ParseOneAcceptsAnObjectOrAOneItemArray()
    {
        var body = """{"00081199": {"vr": "SQ", "Value": [{"00081155": {"vr": "UI", "Value": ["1.2.3"]}}]}}""";
        Assert.Single(DicomJsonDataset.ParseOne(Encoding.UTF8.GetBytes(body), "t").GetSequence(DicomTags.ReferencedSOPSequence));
        Assert.Single(DicomJsonDataset.ParseOne(Encoding.UTF8.GetBytes("[" + body + "]"), "t").GetSequence(DicomTags.ReferencedSOPSequence));
    }

    [Theory]
    [InlineData("{\"0020000D\": {\"vr\": \"UI\"}}")] // an object where an array is expected
    [InlineData("[{\"20000D\": {\"vr\": \"UI\"}}]")] // key not 8 hex digits (F.2.1.1)
    [InlineData("[{\"0020000D\": {\"Value\": [\"1.2\"]}}]")] // no vr (F.2.3)
    [InlineData("[{\"0020000D\": {\"vr\": \"UI\"}")] // truncated JSON
    [InlineData("[1]")]
    public void MalformedAnswersAreFormatErrors(string json) =>
        Assert.Throws<InputFormatException>(() => DicomJsonDataset.ParseArray(Encoding.UTF8.GetBytes(json), "test"));
}
