using Serimetry.Conformance.Dicom;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Xunit;

namespace Serimetry.Conformance.DicomOut;

/// <summary>Files of the Part 10 writer read by dcmtk and GDCM (outside readers), with sequences of both length forms.</summary>
public sealed class WriterReferenceToolTests
{
    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Dcmtk_and_gdcm_read_nested_sequences_and_utf8_text(bool undefinedLengths)
    {
        using var tmp = new ReferenceTool.TempDir();
        var path = tmp.File("w.dcm");
        var ds = new DicomWriteDataset()
            .Add(DicomTags.SOPClassUID, DicomVR.UI, "1.2.840.10008.5.1.4.1.1.7")
            .Add(DicomTags.SOPInstanceUID, DicomVR.UI, DicomUids.New())
            .Add(DicomTags.PatientName, DicomVR.PN, "Müller^Jürgen")
            .AddSequence(DicomTags.ReferencedSeriesSequence, new DicomWriteDataset()
                .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, "1.2.3")
                .AddSequence(DicomTags.ReferencedInstanceSequence,
                    new DicomWriteDataset().Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, "1.2.3.4"),
                    new DicomWriteDataset().Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, "1.2.3.56789")));
        DicomPart10Writer.Write(path, ds, new DicomWriteOptions(undefinedLengths));

        // Src: dcmtk dcmdump parses the file and reports the sequence form it found.
        var dump = ReferenceTool.Capture("dcmdump", "+U8", path);
        Assert.Contains("Müller^Jürgen", dump, StringComparison.Ordinal);
        Assert.Contains("[1.2.3.56789]", dump, StringComparison.Ordinal);
        Assert.Contains(undefinedLengths ? "Sequence with undefined length" : "Sequence with explicit length", dump, StringComparison.Ordinal);
        Assert.DoesNotContain("rror", dump, StringComparison.Ordinal);
        // Src: GDCM gdcmdump parses the same file.
        var gdcm = ReferenceTool.Capture("gdcmdump", path);
        Assert.Contains("1.2.3.56789", gdcm, StringComparison.Ordinal);
        Assert.Contains("(0008,114a)", gdcm, StringComparison.Ordinal);
    }
}
