using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Change;

/// <summary>Pairing of visits, missing values and ordering errors in the change engine.</summary>
public class ChangeEngineTests
{
    private static readonly MeasureDescriptor Volume = new("lesion.volume", "mL", ErrorScale.Log, "lesion.volume", TrendScale.Log);

    private static VisitMeasurements Visit(int i, DateOnly d, double? v) => new(i, d, new Dictionary<string, MeasureValue>
    {
        ["lesion.volume"] = v is double x
            ? new MeasureValue("lesion.volume", x, "mL", MeasureStatus.Ok, null, new Dictionary<string, string>())
            : new MeasureValue("lesion.volume", null, "mL", MeasureStatus.NotApplicable, "the lesion mask is empty", new Dictionary<string, string>()),
    });

    [Fact]
    public void EachFollowUpIsComparedWithBaselineAndPreviousVisit()
    {
        var visits = new[] { Visit(0, new(2020, 1, 1), 1.0), Visit(1, new(2021, 1, 1), 1.1), Visit(2, new(2022, 1, 1), 1.5), Visit(3, new(2023, 1, 1), 2.0) };
        var a = ChangeEngine.Analyse(visits, [Volume], new RepeatabilityProfile("empty", []));
        var pairs = a.Changes.Select(c => (c.FromVisit, c.ToVisit)).ToList();
        Assert.Equal([(0, 1), (0, 2), (1, 2), (0, 3), (2, 3)], pairs);
        Assert.All(a.Changes, c => Assert.Null(c.ExceedsNoise));
        Assert.Single(a.Trends);
    }

    [Fact]
    public void MissingValueIsFlaggedNotInvented()
    {
        var visits = new[] { Visit(0, new(2020, 1, 1), 1.0), Visit(1, new(2021, 1, 1), null) };
        var a = ChangeEngine.Analyse(visits, [Volume], new RepeatabilityProfile("empty", []));
        Assert.Empty(a.Changes);
        Assert.Contains(a.Flags, f => f.Contains("visit 1") && f.Contains("empty"));
    }

    [Fact]
    public void VisitsOutOfOrderAreAClearError()
    {
        var visits = new[] { Visit(0, new(2021, 1, 1), 1.0), Visit(1, new(2020, 1, 1), 1.2) };
        var ex = Assert.Throws<InvalidParameterException>(() => ChangeEngine.Analyse(visits, [Volume], new RepeatabilityProfile("p", [])));
        Assert.Contains("out of order", ex.Message);
    }
}
