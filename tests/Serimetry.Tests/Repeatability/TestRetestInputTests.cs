using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Repeatability;

public sealed class TestRetestInputTests
{
    private static IReadOnlyList<RepeatabilityObservation> Csv(string text) => TestRetestCsv.Read(new StringReader(text), "t.csv");

    [Fact]
    public void NonNumericValueNamesTheLine()
    {
        var e = Assert.Throws<InputFormatException>(() => Csv("subject,measure,repeat,value\nA,m,1,1.5\nA,m,2,abc\n"));
        Assert.Contains("line 3", e.Describe());
        Assert.Contains("abc", e.Message);
    }

    [Fact]
    public void MissingColumnAndEmptyLabelsAreErrors()
    {
        Assert.Throws<InputFormatException>(() => Csv("subject,measure,value\nA,m,1\n"));
        Assert.Throws<InputFormatException>(() => Csv("subject,measure,repeat,value\n,m,1,2\n"));
        Assert.Throws<InputFormatException>(() => Csv("subject,measure,repeat,value\nA,m\n"));
        Assert.Throws<InputFormatException>(() => Csv(""));
    }

    [Fact]
    public void EmptyOrNaValueIsAMissingRepeatAndIsReported()
    {
        var rows = Csv("Subject,Measure,Repeat,Value\nA,m,1,10\nA,m,2,12\nB,m,1,20\nB,m,2,NA\nC,m,1,30\nC,m,2,31\nD,m,1,\"15\"\nD,m,2,\n");
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.Equal(2, m.NSubjects);
        Assert.Contains(m.Notes, n => n.Contains("missing"));
        Assert.Contains(m.Notes, n => n.Contains("fewer than two"));
        // Two pairs (10,12) and (30,31): pooled variance (2 + 0.5)/2 [Bland note: pair variance = d²/2].
        Assert.Equal(Math.Sqrt(1.25), m.WithinSubjectSd, 12);
    }

    [Fact]
    public void SingleRepeatsAreAClearError()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,10\nB,m,1,12\n");
        var e = Assert.Throws<InputFormatException>(() => TestRetestAnalysis.Analyse(rows));
        Assert.Contains("two or more", e.Message);
    }

    [Fact]
    public void DuplicateRepeatIsAnError()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,10\nA,m,1,12\n");
        Assert.Throws<InputFormatException>(() => TestRetestAnalysis.Analyse(rows));
    }

    [Fact]
    public void ZeroVarianceGivesZeroWsdAndUndefinedIcc()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,5\nA,m,2,5\nB,m,1,5\nB,m,2,5\n");
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.Equal(0, m.WithinSubjectSd);
        Assert.Equal(0, m.Rc);
        Assert.Null(m.Icc.Icc11.Value);
        Assert.Null(m.BlandAltman);
        Assert.Contains(m.Notes, n => n.Contains("all values are equal"));
    }

    [Fact]
    public void NoWithinSubjectErrorGivesIccOne()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,5\nA,m,2,5\nB,m,1,9\nB,m,2,9\nC,m,1,7\nC,m,2,7\n");
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.Equal(1.0, m.Icc.Icc11.Value!.Value, 12);
        Assert.Equal(1.0, m.Icc.Icc31.Value!.Value, 12);
    }

    [Fact]
    public void LogAndRmsWcvAgreeForSmallProportionalError()
    {
        // Src: Bland, "How should I calculate a within-subject CV?" (www-users.york.ac.uk/~mb55/meas/cv.htm):
        // the log and RMS methods give very similar estimates.
        var rng = new Random(11);
        var rows = new List<RepeatabilityObservation>();
        for (int s = 0; s < 200; s++)
        {
            double t = 6 + Normal(rng);
            rows.Add(new($"S{s}", "m", "1", t + Normal(rng) * t / 20));
            rows.Add(new($"S{s}", "m", "2", t + Normal(rng) * t / 20));
        }
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.InRange(m.WithinSubjectCv!.Value, 0.04, 0.06);
        Assert.Equal(m.WithinSubjectCv!.Value, m.WithinSubjectCvRms!.Value, 2);
    }

    [Fact]
    public void NegativeValuesLeaveLogWcvUndefined()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,-1\nA,m,2,1\nB,m,1,3\nB,m,2,4\n");
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.Null(m.WithinSubjectCv);
        Assert.Contains(m.Notes, n => n.Contains("log method"));
    }

    [Fact]
    public void UnbalancedDataUsesAllSubjectsForOneWayAndCompleteOnesForTwoWay()
    {
        var rows = Csv("subject,measure,repeat,value\nA,m,1,10\nA,m,2,11\nA,m,3,12\nB,m,1,20\nB,m,2,22\nC,m,1,30\nC,m,2,29\nC,m,3,31\nD,m,1,15\nD,m,2,16\nD,m,3,14\n");
        var m = TestRetestAnalysis.Analyse(rows).Measures.Single();
        Assert.Equal(4, m.NSubjects);
        Assert.Equal(3, m.NCompleteSubjects);
        Assert.NotNull(m.Icc.Icc11.Value);
        Assert.NotNull(m.Icc.Icc31.Value);
        Assert.Contains(m.Notes, n => n.Contains("k0"));
    }

    internal static double Normal(Random rng) =>
        Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
