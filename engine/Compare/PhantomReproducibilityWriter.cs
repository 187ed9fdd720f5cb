using System.Text.Json;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Writes a phantom QA run as a repeatability profile JSON (loadable by <see cref="RepeatabilityProfile.Load"/>)
/// with the extra top-level fields <c>phantomQa</c> (spec subject, repeats) and <c>falsePositiveRates</c>.
/// </summary>
public static class PhantomReproducibilityWriter
{
    /// <summary>Writes the report to a file.</summary>
    public static void WriteFile(string path, PhantomReproducibilityReport report, DateOnly runDate)
    {
        using var f = File.Create(path);
        TestRetestProfileWriter.Write(f, report.Statistics, runDate, ScaleChoice.Auto, null, $"phantom QA run {runDate:yyyy-MM-dd}", w =>
        {
            w.WriteStartObject("phantomQa");
            w.WriteNumber("repeats", report.Repeats);
            w.WriteString("judgedAgainst", report.ProfileName);
            w.WriteString("design", "re-acquisitions of one phantom differing only in noise: no true change");
            w.WriteEndObject();
            w.WriteStartArray("falsePositiveRates");
            foreach (var r in report.FalsePositiveRates) WriteRate(w, r);
            w.WriteEndArray();
        });
    }

    /// <summary>
    /// Writes the per-repeat radiomic features as a test-retest feature table (<see cref="Radiomics.Robustness.TestRetestTable"/>),
    /// repeats labelled r1, r2 … as in the profile; several runs (phantoms or subjects) concatenated give the ICCs that
    /// <c>compare --radiomics-robustness</c> uses.
    /// </summary>
    public static void WriteRadiomicFeatures(string path, PhantomReproducibilityReport report)
    {
        using var w = new StreamWriter(path);
        Radiomics.Robustness.TestRetestTable.Write(w, report.RadiomicFeatures);
    }

    private static void WriteRate(Utf8JsonWriter w, FalsePositiveRate r)
    {
        w.WriteStartObject();
        w.WriteString("measure", r.Measure);
        w.WriteNumber("pairs", r.Pairs);
        w.WriteNumber("exceedingProfile", r.ExceedingProfile);
        if (r.RateProfile is double p) w.WriteNumber("rateProfile", p); else w.WriteNull("rateProfile");
        w.WriteString("profileSource", r.ProfileSource);
        w.WriteNumber("exceedingOwnRc", r.ExceedingOwnRc);
        w.WriteNumber("rateOwnRc", r.RateOwnRc);
        w.WriteEndObject();
    }
}
