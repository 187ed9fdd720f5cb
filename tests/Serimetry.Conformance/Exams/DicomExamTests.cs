using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Io;
using Serimetry.Engine.Repeatability;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Exams;

/// <summary>
/// Exams read from real DICOM (Src: shared/reference/mr, ProstateX cases; sizes, spacings and dates as its
/// README documents from dcmtk's reading).
/// </summary>
public class DicomExamTests
{
    private static string Case(string name) => Directory.GetDirectories(SharedReference.PathOf("mr", name)).Single();

    [Fact]
    public void LoadsTheT2wAndScannerAdcOfARealExam()
    {
        var exam = ExamLoader.Load(Case("ProstateX-0000")).Exam;
        Assert.Equal(new Size3(384, 384, 19), exam.T2w.Size);
        Assert.Equal(0.5, exam.T2w.Geometry.SpacingMm.X, 3);
        Assert.Equal(3.0, exam.T2w.Geometry.SpacingMm.Z, 3);
        Assert.Equal(new Size3(84, 128, 19), exam.Adc.Size);
        Assert.Equal(AdcSource.Scanner, exam.AdcSource);
        Assert.Equal(new DateOnly(2011, 7, 7), exam.Date);
        Assert.Equal([50.0, 400.0, 800.0], exam.BValues);
    }

    [Fact]
    public void RefusesToCompareExamsOfTwoPatients()
    {
        // ProstateX-0000 and ProstateX-0001 are different (de-identified) patients.
        var request = new CompareRequest(Case("ProstateX-0000"), [Case("ProstateX-0001")], null, null, [],
            RepeatabilityProfile.LoadDefault(), new ComparisonOptions());
        var e = Assert.Throws<InputFormatException>(() => ComparePipeline.Run(request));
        Assert.Contains("different patients", e.Message);
    }
}
