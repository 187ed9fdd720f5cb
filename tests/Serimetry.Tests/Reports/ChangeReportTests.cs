using System.Text.Json;
using System.Text.Json.Nodes;
using Json.Schema;
using Serimetry.Engine;
using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Reports;
using Serimetry.Engine.Repeatability;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Reports;

/// <summary>change.json against the published schema (validated with JsonSchema.Net, a general JSON Schema
/// 2020-12 validator), round trip, partial marking and the ARCHITECTURE.md minimum field names.</summary>
public class ChangeReportTests
{
    private static readonly Lazy<JsonSchema> Schema = new(() =>
        JsonSchema.FromText(File.ReadAllText(Path.Combine(SharedReference.RepoRoot, "schemas", "change.schema.json"))));

    private static EvaluationResults Validate(string json)
    {
        using var doc = JsonDocument.Parse(json);
        return Schema.Value.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
    }

    private static string Errors(EvaluationResults r) => string.Join("; ",
        (r.Details ?? []).Where(d => d.Errors is { Count: > 0 }).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}")));

    [Fact]
    public void SerialisedReportValidatesAgainstTheSchema()
    {
        var json = ChangeReportJson.Serialize(ReportFixture.Default);
        var r = Validate(json);
        Assert.True(r.IsValid, Errors(r));
    }

    [Fact]
    public void ReportCarriesTheArchitectureMinimumFields()
    {
        // Src: ARCHITECTURE.md "change.json (minimum content)".
        var root = JsonNode.Parse(ChangeReportJson.Serialize(ReportFixture.Default))!.AsObject();
        foreach (var k in new[] { "schemaVersion", "software", "caution", "visits", "changes", "trends", "comparability" })
            Assert.True(root.ContainsKey(k), k);
        var visit = root["visits"]![1]!.AsObject();
        foreach (var k in new[] { "index", "date", "studyInstanceUid", "registration", "values" }) Assert.True(visit.ContainsKey(k), k);
        foreach (var k in new[] { "transform", "metricBefore", "metricAfter", "glandDice", "flags" })
            Assert.True(visit["registration"]!.AsObject().ContainsKey(k), k);
        var value = visit["values"]!["lesion.volume"]!.AsObject();
        Assert.True(value.ContainsKey("value") && value.ContainsKey("unit"));
        var change = root["changes"]![0]!.AsObject();
        foreach (var k in new[] { "measure", "unit", "fromVisit", "toVisit", "baseline", "followup", "delta", "relativeDelta", "ci95",
                     "repeatabilityCoefficient", "repeatabilitySource", "exceedsNoise", "direction" })
            Assert.True(change.ContainsKey(k), k);
        var trend = root["trends"]![0]!.AsObject();
        foreach (var k in new[] { "measure", "slopePerYear", "ci95", "doublingTimeYears", "nVisits" }) Assert.True(trend.ContainsKey(k), k);
        var item = root["comparability"]![0]!.AsObject();
        foreach (var k in new[] { "fromVisit", "toVisit", "item", "baseline", "followup", "severity", "message" }) Assert.True(item.ContainsKey(k), k);
        Assert.Equal(SoftwareInfo.Caution, root["caution"]!.GetValue<string>());
    }

    [Fact]
    public void GrowingLesionIsFlaggedAndAdcDropMeasured()
    {
        // The fixture's lesion radius grows 5 → 7.5 mm (volume ×3.4): beyond the wCV-10 % band.
        var report = ReportFixture.Default;
        var vol = report.Changes.Single(c => c.Measure == "lesion.volume" && c.FromVisit == 0 && c.ToVisit == 2);
        Assert.True(vol.ExceedsNoise);
        Assert.Equal(ChangeDirection.Increase, vol.Direction);
        // Src: analytic sphere volume ratio (7.5/5)³; 5 % tolerance for voxelising small spheres with 3 mm slices.
        Assert.InRange(vol.Followup / vol.Baseline / Math.Pow(7.5 / 5, 3), 0.95, 1.05);
        Assert.Equal(3, report.Changes.Count(c => c.Measure == "lesion.volume")); // 0→1, 0→2, 1→2
        Assert.Contains(report.Trends, t => t.Measure == "lesion.volume" && t.DoublingTimeYears > 0);
        Assert.Contains(report.Trends, t => t.Measure == PsaKinetics.VelocityId);
        Assert.Equal(3, report.HistogramDistances.Count);
        Assert.Contains(report.Comparability, c => c.Item == "adc.bValues");
        Assert.False(report.Partial);
    }

    [Fact]
    public void RoundTripKeepsTheReport()
    {
        var report = ReportFixture.Default;
        var json = ChangeReportJson.Serialize(report);
        var back = ChangeReportJson.Deserialize(json);
        Assert.Equal(json, ChangeReportJson.Serialize(back));
    }

    [Fact]
    public void FailedMeasureMakesThePartialFlagTrue()
    {
        var report = ReportFixture.Build(extra: new FailingMeasure());
        Assert.True(report.Partial);
        Assert.Contains(report.Problems, p => p.Contains("test.fails") && p.Contains("visit 0"));
        Assert.True(Validate(ChangeReportJson.Serialize(report)).IsValid);
        Assert.True(ReportFixture.Build(problems: ["visit 2: alignment did not converge"]).Partial);
    }

    [Theory]
    [InlineData("changes", "direction", "\"bigger\"")]
    [InlineData("changes", "ci95", "[1]")]
    [InlineData("trends", "nVisits", "\"three\"")]
    [InlineData("comparability", "severity", "\"minor\"")]
    public void SchemaRejectsBrokenReports(string array, string field, string replacement)
    {
        // The validator can fail: each broken document must be rejected.
        var root = JsonNode.Parse(ChangeReportJson.Serialize(ReportFixture.Default))!.AsObject();
        root[array]![0]![field] = JsonNode.Parse(replacement);
        Assert.False(Validate(root.ToJsonString()).IsValid);
        root[array]![0]!.AsObject().Remove(field);
        Assert.False(Validate(root.ToJsonString()).IsValid);
    }

    [Fact]
    public void MalformedOrForeignVersionJsonIsAClearError()
    {
        Assert.Throws<InputFormatException>(() => ChangeReportJson.Deserialize("{\"visits\": [", "x.json"));
        var root = JsonNode.Parse(ChangeReportJson.Serialize(ReportFixture.Default))!.AsObject();
        root["schemaVersion"] = "2.0";
        Assert.Throws<UnsupportedInputException>(() => ChangeReportJson.Deserialize(root.ToJsonString()));
    }

    private sealed class FailingMeasure : IMeasure
    {
        public string Id => "test.fails";
        public string Unit => "1";
        public string Description => "always fails";
        public MeasureInputs Inputs => MeasureInputs.None;
        public ErrorScale ErrorScale => ErrorScale.Absolute;
        public MeasureValue Measure(VisitContext context) => MeasureValue.Failed(this, "deliberate failure");
    }
}
