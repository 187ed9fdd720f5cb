using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Radiomics;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.Radiomics;

/// <summary>
/// Every implemented feature against the IBSI digital-phantom reference values.
/// Src: IBSI chapter 1 reference values (Zwanenburg et al., Radiology 2020, doi:10.1148/radiol.2020191145),
/// shared/reference/ibsi/reference_values/ibsi1_digital_phantom_reference_values.csv.
/// </summary>
public sealed class IbsiPhantomConformanceTests(ITestOutputHelper output)
{
    private static readonly Lazy<IReadOnlyList<FeatureValue>> Computed = new(Compute);

    private static IReadOnlyList<FeatureValue> Compute()
    {
        var (image, mask) = IbsiPhantom.Load();
        var json = File.ReadAllText(Path.Combine(SharedReference.RepoRoot, "phantoms", "ibsi-digital-phantom.settings.json"));
        return RadiomicsExtractor.Extract(image, mask, RadiomicsSettingsJson.Parse(json, "ibsi-digital-phantom.settings.json"));
    }

    /// <summary>The computed value for a reference row: same IBSI code and aggregation, the name breaking ties.</summary>
    private static FeatureValue? Match(IbsiPhantom.Row row)
    {
        var candidates = Computed.Value.Where(v => v.IbsiCode == row.Code && v.AggregationCode == row.EngineAggregationCode).ToList();
        return candidates.Count <= 1 ? candidates.FirstOrDefault() : candidates.FirstOrDefault(v => v.Feature == row.Feature);
    }

    public static TheoryData<string> Families() =>
    [
        "morphology", "local intensity", "intensity-based statistics", "intensity histogram", "intensity-volume histogram",
        "grey level co-occurrence matrix (GLCM)", "grey level run length matrix (GLRLM)", "grey level size zone matrix (GLSZM)",
        "grey level distance zone matrix (GLDZM)", "neighbourhood grey tone difference matrix (NGTDM)",
        "neighbouring grey level dependence matrix (NGLDM)",
    ];

    [Theory]
    [MemberData(nameof(Families))]
    public void Family_matches_IBSI_reference_values(string family)
    {
        var rows = IbsiPhantom.ReferenceRows().Where(r => r.Family == family).ToList();
        Assert.NotEmpty(rows);
        var failures = new List<string>();
        int implemented = 0;
        foreach (var row in rows)
        {
            var value = Match(row);
            if (value is null) continue;
            implemented++;
            if (!row.Accepts(value.Value))
                failures.Add(string.Create(CultureInfo.InvariantCulture,
                    $"{row.Feature} [{row.Code}/{row.AggregationCode}]: computed {value.Value:G6}, IBSI {row.ReferenceText} ± {row.Tolerance}"));
        }
        output.WriteLine($"{family}: {implemented - failures.Count}/{rows.Count} pass, {implemented} implemented");
        foreach (var f in failures) output.WriteLine("  FAIL " + f);
        Assert.True(implemented > 0, "no feature of this family is implemented");
        Assert.True(failures.Count == 0, string.Join("\n", failures));
    }

    [Fact]
    public void Summary_counts_passes_over_all_482_reference_values()
    {
        var rows = IbsiPhantom.ReferenceRows();
        Assert.Equal(482, rows.Count);
        int pass = 0, missing = 0;
        foreach (var row in rows)
        {
            var value = Match(row);
            if (value is null) { missing++; output.WriteLine($"not implemented: {row.Family} / {row.Feature} [{row.AggregationCode}]"); }
            else if (row.Accepts(value.Value)) pass++;
            if (value is not null)
                output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"{(row.Accepts(value.Value) ? "ok  " : "FAIL")} {row.Family} / {row.Feature} [{row.AggregationCode}]: {value.Value:G6} vs {row.ReferenceText}"));
        }
        output.WriteLine($"IBSI digital phantom: {pass}/{rows.Count} reference values pass; {missing} not implemented");
        Assert.True(pass + missing == rows.Count, $"{rows.Count - pass - missing} implemented values fail");
    }
}
