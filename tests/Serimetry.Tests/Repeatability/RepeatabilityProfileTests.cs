using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Repeatability;

public sealed class RepeatabilityProfileTests
{
    private static readonly string[] RequiredIds =
    [
        "lesion.volume", "gland.volume", "lesion.diameter.max", "lesion.volume.ellipsoid", "gland.volume.ellipsoid",
        "lesion.adc.mean", "lesion.adc.median", "lesion.adc.p10", "lesion.conspicuity.t2w", "lesion.conspicuity.adc", "psa.density",
    ];

    [Fact]
    public void DefaultProfileLoadsFromTheEngineAndCitesEachEntry()
    {
        var p = RepeatabilityProfile.LoadDefault();
        foreach (var id in RequiredIds)
        {
            var e = p.Find(id);
            Assert.NotNull(e);
            Assert.False(string.IsNullOrWhiteSpace(e!.Source));
        }
        // Src: QIBA DWI Profile 2022 / Boss et al. JMRI 2022 (facts.md §2): prostate lesion ADC wCV 0.17.
        Assert.Equal(0.17, p.Find("lesion.adc.median")!.WithinSubjectCv);
        Assert.Equal(ErrorScale.Log, p.Find("lesion.adc.median")!.Scale);
    }

    [Fact]
    public void SdLogInvertsTheLognormalWcv()
    {
        var e = new RepeatabilityEntry("x", ErrorScale.Log, null, 0.17, "", "t");
        double s = e.SdLog!.Value;
        Assert.Equal(0.17, Math.Sqrt(Math.Exp(s * s) - 1), 12);
    }

    [Fact]
    public void TestRetestOutputIsALoadableProfile()
    {
        var rows = new List<RepeatabilityObservation>();
        var rng = new Random(3);
        for (int s = 0; s < 12; s++)
        {
            double t = 800 + 100 * TestRetestInputTests.Normal(rng);
            rows.Add(new($"S{s}", "lesion.adc.median", "scan1", t * (1 + 0.05 * TestRetestInputTests.Normal(rng))));
            rows.Add(new($"S{s}", "lesion.adc.median", "scan2", t * (1 + 0.05 * TestRetestInputTests.Normal(rng))));
            rows.Add(new($"S{s}", "shift", "scan1", TestRetestInputTests.Normal(rng)));
            rows.Add(new($"S{s}", "shift", "scan2", TestRetestInputTests.Normal(rng)));
        }
        var report = TestRetestAnalysis.Analyse(rows);
        using var ms = new MemoryStream();
        TestRetestProfileWriter.Write(ms, report, new DateOnly(2026, 12, 1));
        var json = System.Text.Encoding.UTF8.GetString(ms.ToArray());
        var profile = RepeatabilityProfile.Parse(json, "profile.json");
        var adc = profile.Find("lesion.adc.median")!;
        Assert.Equal(ErrorScale.Log, adc.Scale);
        Assert.Equal("site QA run 2026-12-01", adc.Source);
        Assert.Equal(report.Measures[0].WithinSubjectCv!.Value, adc.WithinSubjectCv!.Value, 12);
        Assert.Equal(ErrorScale.Absolute, profile.Find("shift")!.Scale);
        Assert.Contains("\"icc21\"", json);
        Assert.Contains("\"blandAltman\"", json);
    }

    [Fact]
    public void MalformedProfilesAreClearErrors()
    {
        Assert.Throws<InputFormatException>(() => RepeatabilityProfile.Parse("{", "p.json"));
        Assert.Throws<InputFormatException>(() => RepeatabilityProfile.Parse("{\"measures\":{}}", "p.json"));
        Assert.Throws<InputFormatException>(() => RepeatabilityProfile.Parse("{\"measures\":[{\"measure\":\"a\",\"scale\":\"log\",\"source\":\"s\"}]}", "p.json"));
        Assert.Throws<InputFormatException>(() => RepeatabilityProfile.Parse("{\"measures\":[{\"measure\":\"a\",\"wCV\":0.1}]}", "p.json"));
        Assert.Throws<InputFormatException>(() => RepeatabilityProfile.Load("/nonexistent/profile.json"));
    }
}
