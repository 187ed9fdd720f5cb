using Serimetry.Engine.Reports;
using Xunit;

namespace Serimetry.Tests.Reports;

/// <summary>measures.csv and changes.csv: tidy layout, RFC 4180 quoting, values that parse back.</summary>
public class TidyCsvTests
{
    [Fact]
    public void MeasuresCsvHasOneRowPerVisitAndMeasure()
    {
        var report = ReportFixture.Default;
        var lines = TidyCsv.Measures(report).TrimEnd('\n').Split('\n');
        Assert.Equal(TidyCsv.MeasuresHeader, lines[0]);
        Assert.Equal(1 + report.Visits.Sum(v => v.Values.Count), lines.Length);
        var row = lines.Single(l => l.StartsWith("1,2022-09-01,lesion.volume,", StringComparison.Ordinal)).Split(',');
        Assert.Equal(report.Visits[1].Values["lesion.volume"].Value!.Value, double.Parse(row[3], System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal("mL", row[4]);
        Assert.Equal("ok", row[5]);
    }

    [Fact]
    public void ChangesCsvMatchesTheChanges()
    {
        var report = ReportFixture.Default;
        var lines = TidyCsv.Changes(report).TrimEnd('\n').Split('\n');
        Assert.Equal(TidyCsv.ChangesHeader, lines[0]);
        Assert.Equal(report.Changes.Count + 1, lines.Length);
        Assert.Contains(lines, l => l.StartsWith("lesion.volume,mL,0,2,", StringComparison.Ordinal) && l.EndsWith(",true,increase", StringComparison.Ordinal));
    }

    [Fact]
    public void CellsWithCommasAndQuotesAreQuoted()
    {
        // Src: RFC 4180 §2: fields with commas, quotes or line breaks are enclosed in double quotes, quotes doubled.
        Assert.Equal("\"a,b\"", TidyCsv.Quote("a,b"));
        Assert.Equal("\"say \"\"hi\"\"\"", TidyCsv.Quote("say \"hi\""));
        Assert.Equal("plain", TidyCsv.Quote("plain"));
    }
}
