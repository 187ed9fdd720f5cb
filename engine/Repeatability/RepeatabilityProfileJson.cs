using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Repeatability;

/// <summary>
/// Reads repeatability profiles. One schema serves the shipped default profile and the output of
/// <c>serimetry qa test-retest</c> (docs/qa.md): a top-level object with <c>measures</c>, an array of
/// objects each with <c>measure</c> (id), <c>source</c> (citation or "site QA run YYYY-MM-DD"), and
/// <c>wCV</c> (fraction) and/or <c>wSD</c> (measure unit); optional <c>scale</c> ("log" or "absolute";
/// default log when wCV is given, else absolute), <c>unit</c> and <c>name</c>. Other fields are ignored.
/// </summary>
internal static class RepeatabilityProfileJson
{
    internal const string DefaultResourceName = "Serimetry.Engine.Repeatability.repeatability-default.json";

    internal static RepeatabilityProfile Parse(string json, string where, string fallbackName)
    {
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(json, new JsonDocumentOptions { AllowTrailingCommas = true, CommentHandling = JsonCommentHandling.Skip, MaxDepth = 32 });
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"not valid JSON ({e.Message})", where, "fix the profile file or regenerate it with 'serimetry qa test-retest'", e);
        }
        using (doc)
        {
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("measures", out var measures) || measures.ValueKind != JsonValueKind.Array)
                throw new InputFormatException("expected an object with a 'measures' array", where, "see docs/qa.md for the profile schema");
            string name = root.TryGetProperty("name", out var n) && n.ValueKind == JsonValueKind.String ? n.GetString()! : fallbackName;
            var entries = new List<RepeatabilityEntry>();
            int i = 0;
            foreach (var m in measures.EnumerateArray())
            {
                var entry = ParseEntry(m, $"{where} measures[{i++}]");
                if (entries.Any(e => e.Measure == entry.Measure))
                    throw new InputFormatException($"measure '{entry.Measure}' appears twice", where, "keep one entry per measure id");
                entries.Add(entry);
            }
            return new RepeatabilityProfile(name, entries);
        }
    }

    private static RepeatabilityEntry ParseEntry(JsonElement m, string at)
    {
        if (m.ValueKind != JsonValueKind.Object) throw new InputFormatException("entry is not an object", at);
        string measure = RequiredString(m, "measure", at);
        string source = RequiredString(m, "source", at);
        double? wcv = OptionalNumber(m, "wCV", at);
        double? wsd = OptionalNumber(m, "wSD", at);
        string unit = m.TryGetProperty("unit", out var u) && u.ValueKind == JsonValueKind.String ? u.GetString()! : "";
        ErrorScale scale = wcv is not null ? ErrorScale.Log : ErrorScale.Absolute;
        if (m.TryGetProperty("scale", out var s) && s.ValueKind == JsonValueKind.String)
        {
            scale = s.GetString() switch
            {
                "log" => ErrorScale.Log,
                "absolute" => ErrorScale.Absolute,
                var other => throw new InputFormatException($"scale '{other}' is neither 'log' nor 'absolute'", at),
            };
        }
        if (scale == ErrorScale.Log && !(wcv > 0))
            throw new InputFormatException($"log-scale entry '{measure}' needs a positive wCV", at, "give wCV as a fraction (0.17 for 17 %)");
        if (scale == ErrorScale.Absolute && !(wsd >= 0))
            throw new InputFormatException($"absolute-scale entry '{measure}' needs a non-negative wSD", at, "give wSD in the measure's unit");
        return new RepeatabilityEntry(measure, scale, wsd, wcv, unit, source);
    }

    private static string RequiredString(JsonElement m, string name, string at)
    {
        if (!m.TryGetProperty(name, out var v) || v.ValueKind != JsonValueKind.String || string.IsNullOrWhiteSpace(v.GetString()))
            throw new InputFormatException($"missing string field '{name}'", at, "see docs/qa.md for the profile schema");
        return v.GetString()!;
    }

    private static double? OptionalNumber(JsonElement m, string name, string at)
    {
        if (!m.TryGetProperty(name, out var v) || v.ValueKind == JsonValueKind.Null) return null;
        if (v.ValueKind != JsonValueKind.Number || !v.TryGetDouble(out var d) || !double.IsFinite(d))
            throw new InputFormatException($"field '{name}' is not a finite number", at);
        return d;
    }

    internal static string Format(double v) => v.ToString("R", CultureInfo.InvariantCulture);
}
