using System.Text.Json;

namespace Serimetry.Engine.Repeatability;

/// <summary>How the error scale of each written entry is chosen.</summary>
public enum ScaleChoice
{
    /// <summary>Log scale (wCV) when every value is positive and wCV is defined, else absolute (wSD).</summary>
    Auto,

    /// <summary>Always log scale (fails for measures without a wCV).</summary>
    Log,

    /// <summary>Always absolute scale.</summary>
    Absolute,
}

/// <summary>
/// Writes a <see cref="TestRetestReport"/> as a repeatability profile JSON (docs/qa.md): each entry
/// carries the statistics and the fields the profile loader reads (measure, scale, wSD, wCV, unit,
/// source = "site QA run YYYY-MM-DD"), so the file is both a QA record and a usable profile.
/// </summary>
public static class TestRetestProfileWriter
{
    /// <summary>Schema id written to the file.</summary>
    public const string SchemaId = "serimetry-repeatability/1";

    /// <summary>Writes the report to <paramref name="stream"/> as indented UTF-8 JSON.</summary>
    /// <param name="stream">Destination.</param>
    /// <param name="report">Statistics to write.</param>
    /// <param name="runDate">Date recorded in each entry's source ("site QA run YYYY-MM-DD").</param>
    /// <param name="scale">How each entry's error scale is chosen.</param>
    /// <param name="units">Optional unit per measure id.</param>
    /// <param name="name">Profile name (default "site QA run YYYY-MM-DD").</param>
    /// <param name="extra">Writes additional top-level properties (e.g. a QA run's false-positive rates).</param>
    public static void Write(Stream stream, TestRetestReport report, DateOnly runDate, ScaleChoice scale = ScaleChoice.Auto,
        IReadOnlyDictionary<string, string>? units = null, string? name = null, Action<Utf8JsonWriter>? extra = null)
    {
        using var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true });
        w.WriteStartObject();
        w.WriteString("schema", SchemaId);
        w.WriteString("name", name ?? $"site QA run {runDate:yyyy-MM-dd}");
        w.WriteString("software", $"{SoftwareInfo.Name} {SoftwareInfo.Version}");
        w.WriteString("wcvMethod", "log: sqrt(exp(s^2)-1), s = wSD of ln values; wCvRms is the RMS of per-subject CVs");
        w.WriteStartArray("measures");
        foreach (var m in report.Measures) WriteMeasure(w, m, runDate, scale, units);
        w.WriteEndArray();
        extra?.Invoke(w);
        w.WriteEndObject();
    }

    /// <summary>Writes the report to a file.</summary>
    public static void WriteFile(string path, TestRetestReport report, DateOnly runDate, ScaleChoice scale = ScaleChoice.Auto,
        IReadOnlyDictionary<string, string>? units = null)
    {
        using var f = File.Create(path);
        Write(f, report, runDate, scale, units);
    }

    private static void WriteMeasure(Utf8JsonWriter w, MeasureRepeatability m, DateOnly runDate, ScaleChoice scale,
        IReadOnlyDictionary<string, string>? units)
    {
        bool log = scale switch
        {
            ScaleChoice.Log => m.WithinSubjectCv is not null ? true
                : throw new Core.InvalidParameterException($"measure '{m.Measure}' has no wCV (a value is ≤ 0)", "--scale", "use --scale auto or absolute"),
            ScaleChoice.Absolute => false,
            _ => m.WithinSubjectCv is not null,
        };
        w.WriteStartObject();
        w.WriteString("measure", m.Measure);
        w.WriteString("scale", log ? "log" : "absolute");
        w.WriteString("unit", units is not null && units.TryGetValue(m.Measure, out var u) ? u : "");
        w.WriteString("source", $"site QA run {runDate:yyyy-MM-dd}");
        w.WriteNumber("nSubjects", m.NSubjects);
        w.WriteNumber("nRepeats", m.NRepeats);
        w.WriteNumber("nObservations", m.NObservations);
        w.WriteNumber("nCompleteSubjects", m.NCompleteSubjects);
        w.WriteNumber("mean", m.Mean);
        w.WriteNumber("wSD", m.WithinSubjectSd);
        WriteInterval(w, "wSDCi", m.WithinSubjectSdCi);
        WriteNullable(w, "wCV", m.WithinSubjectCv);
        WriteNullable(w, "wCvRms", m.WithinSubjectCvRms);
        WriteNullable(w, "sdLog", m.SdLog);
        w.WriteNumber("rc", m.Rc);
        WriteNullable(w, "rcRelative", m.RcRelative);
        WriteIcc(w, "icc11", m.Icc.Icc11);
        WriteIcc(w, "icc21", m.Icc.Icc21);
        WriteIcc(w, "icc31", m.Icc.Icc31);
        WriteIcc(w, "icc1k", m.Icc.Icc1k);
        WriteIcc(w, "icc2k", m.Icc.Icc2k);
        WriteIcc(w, "icc3k", m.Icc.Icc3k);
        WriteBlandAltman(w, m.BlandAltman);
        w.WriteStartArray("notes");
        foreach (var n in m.Notes) w.WriteStringValue(n);
        w.WriteEndArray();
        w.WriteEndObject();
    }

    private static void WriteIcc(Utf8JsonWriter w, string name, Estimate e)
    {
        WriteNullable(w, name, e.Value);
        WriteInterval(w, name + "Ci", e);
    }

    private static void WriteBlandAltman(Utf8JsonWriter w, BlandAltmanResult? ba)
    {
        if (ba is null) { w.WriteNull("blandAltman"); return; }
        w.WriteStartObject("blandAltman");
        w.WriteString("difference", $"{ba.SecondRepeat} - {ba.FirstRepeat}");
        w.WriteNumber("nPairs", ba.NPairs);
        WriteNullable(w, "bias", ba.Bias.Value);
        WriteInterval(w, "biasCi", ba.Bias);
        w.WriteNumber("sdDifferences", ba.SdDifferences);
        WriteNullable(w, "loaLow", ba.LoaLow.Value);
        WriteInterval(w, "loaLowCi", ba.LoaLow);
        WriteNullable(w, "loaHigh", ba.LoaHigh.Value);
        WriteInterval(w, "loaHighCi", ba.LoaHigh);
        w.WriteEndObject();
    }

    private static void WriteInterval(Utf8JsonWriter w, string name, Estimate e)
    {
        w.WriteStartArray(name);
        if (e.CiLow is double lo) w.WriteNumberValue(lo); else w.WriteNullValue();
        if (e.CiHigh is double hi) w.WriteNumberValue(hi); else w.WriteNullValue();
        w.WriteEndArray();
    }

    private static void WriteNullable(Utf8JsonWriter w, string name, double? v)
    {
        if (v is double d && double.IsFinite(d)) w.WriteNumber(name, d); else w.WriteNull(name);
    }
}
