using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Series;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>Delta features and the long-format export (arithmetic checked by hand; common practice).</summary>
public sealed class RadiomicsTimeSeriesTests
{
    private static VisitFeatures Visit(string id, double volume, double contrast) => new(id, new DateOnly(2025, 1, 1), "gland",
        [new FeatureValue("morphology", "Volume (mesh)", "RNU0", "", volume), new FeatureValue("glcm", "Contrast", "ACUI", "IAZD", contrast)], "t2w");

    [Fact]
    public void Deltas_are_follow_up_minus_baseline_and_respect_the_robust_set()
    {
        var d = RadiomicsTimeSeries.Deltas(Visit("v0", 40, 2), Visit("v1", 50, 3));
        var vol = d.Single(x => x.IbsiCode == "RNU0");
        Assert.Equal(10, vol.Delta, 12);
        Assert.Equal(0.25, vol.RelativeDelta, 12);
        var keep = new HashSet<string> { RadiomicsTimeSeries.KeyOf(Visit("v", 0, 0).Features[1]) };
        Assert.Equal("ACUI", Assert.Single(RadiomicsTimeSeries.Deltas(Visit("v0", 40, 2), Visit("v1", 50, 3), keep)).IbsiCode);
    }

    [Fact]
    public void Long_export_has_one_row_per_visit_and_feature()
    {
        var w = new StringWriter();
        RadiomicsTimeSeries.WriteLong(w, [Visit("v0", 40, double.NaN), Visit("v1", 50, 3)], (_, f) => f.IbsiCode == "RNU0" ? true : null);
        var lines = w.ToString().Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("visit,date,region,image,family,feature,ibsiCode,aggregationCode,value,robust", lines[0]);
        Assert.Equal(5, lines.Length);
        Assert.Equal("v0,2025-01-01,gland,t2w,glcm,Contrast,ACUI,IAZD,,", lines[2]);
        Assert.Equal("v1,2025-01-01,gland,t2w,morphology,Volume (mesh),RNU0,,50,true", lines[3]);
    }
}
