using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>
/// Test-retest reliabilities that decide which features are robust: ICC(2,1) per feature (and region and image when
/// the table names them) from a test-retest feature table (<see cref="TestRetestTable"/>), with the ICC threshold.
/// </summary>
/// <param name="Source">Where the reliabilities come from (a file name; no path).</param>
/// <param name="IccThreshold">ICC at or above which a feature is robust.</param>
/// <param name="Reliabilities">ICC per feature.</param>
/// <param name="Subjects">Most complete subjects behind any feature.</param>
/// <param name="Repeats">Most repeats behind any feature.</param>
public sealed record RobustnessReference(string Source, double IccThreshold, IReadOnlyList<FeatureReliability> Reliabilities,
    int Subjects, int Repeats)
{
    /// <summary>Reads a test-retest feature table and computes ICC(2,1) per feature.</summary>
    public static RobustnessReference FromTestRetestFile(string path, double iccThreshold = FeatureRobustness.DefaultIccThreshold) =>
        FromTestRetest(TestRetestTable.ReadFile(path), Path.GetFileName(path), iccThreshold);

    /// <summary>
    /// ICC(2,1) per feature of <paramref name="values"/>. Refuses a table that cannot give an ICC (fewer than two
    /// subjects with every repeat, or fewer than two repeats): every feature would be dropped, silently.
    /// </summary>
    public static RobustnessReference FromTestRetest(IReadOnlyList<TestRetestValue> values, string source,
        double iccThreshold = FeatureRobustness.DefaultIccThreshold)
    {
        ArgumentNullException.ThrowIfNull(values);
        if (!(iccThreshold is > 0 and <= 1))
            throw new InvalidParameterException($"ICC threshold {iccThreshold.ToString(CultureInfo.InvariantCulture)} must be in (0, 1]",
                "radiomics robustness", $"use {FeatureRobustness.DefaultIccThreshold} (Koo & Li 2016, 'good' reliability)");
        var reliabilities = FeatureRobustness.TestRetest(values, iccThreshold);
        int subjects = reliabilities.Count == 0 ? 0 : reliabilities.Max(r => r.Subjects);
        int repeats = reliabilities.Count == 0 ? 0 : reliabilities.Max(r => r.Repeats);
        if (repeats < 2)
            throw new InputFormatException($"the test-retest feature table has {repeats} repeat(s); an ICC needs at least two", source,
                "give every subject two or more repeats (label them in the repeat column)");
        if (subjects < 2)
            throw new InputFormatException(
                $"the test-retest feature table has {subjects} subject(s) with every repeat; an ICC needs at least two", source,
                "combine the tables of several subjects or phantoms (e.g. QA runs of phantoms with different seeds) into one file");
        return new RobustnessReference(source, iccThreshold, reliabilities, subjects, repeats);
    }
}
