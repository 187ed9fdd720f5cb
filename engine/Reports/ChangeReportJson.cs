using System.Text.Json;
using System.Text.Json.Serialization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Reports;

/// <summary>
/// Reads and writes change.json with System.Text.Json: camelCase names, enums as camelCase strings,
/// indented. Non-finite numbers never reach the file (the engine filters them); should one slip through it
/// is written as null, which the schema then rejects in tests.
/// </summary>
public static class ChangeReportJson
{
    /// <summary>The change.json schema version this code writes (schemas/change.schema.json).</summary>
    public const string SchemaVersion = "1.0";

    /// <summary>The serializer options used for change.json.</summary>
    public static JsonSerializerOptions Options { get; } = CreateOptions();

    /// <summary>The report as JSON text.</summary>
    public static string Serialize(ChangeReport report) => JsonSerializer.Serialize(report, Options);

    /// <summary>Writes the report to <paramref name="path"/> (UTF-8, no BOM).</summary>
    public static void Write(ChangeReport report, string path) => File.WriteAllText(path, Serialize(report) + "\n");

    /// <summary>Parses change.json; a malformed file or another major schema version gives a clear error.</summary>
    public static ChangeReport Deserialize(string json, string where = "change.json")
    {
        ChangeReport? report;
        try
        {
            report = JsonSerializer.Deserialize<ChangeReport>(json, Options);
        }
        catch (JsonException ex)
        {
            throw new InputFormatException($"malformed change report: {ex.Message}", where, "give a change.json written by serimetry compare", ex);
        }
        if (report is null)
            throw new InputFormatException("the change report is empty (null)", where, "give a change.json written by serimetry compare");
        if (report.SchemaVersion?.Split('.')[0] != SchemaVersion.Split('.')[0])
            throw new UnsupportedInputException($"change.json schema version {report.SchemaVersion} is not supported (this build reads {SchemaVersion})",
                where, "re-run the comparison with this version");
        return report;
    }

    private static JsonSerializerOptions CreateOptions()
    {
        var o = new JsonSerializerOptions
        {
            PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
            WriteIndented = true,
            DefaultIgnoreCondition = JsonIgnoreCondition.Never,
        };
        o.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.CamelCase, allowIntegerValues: false));
        o.Converters.Add(new FiniteDoubleConverter());
        o.MakeReadOnly(populateMissingResolver: true);
        return o;
    }

    /// <summary>Writes non-finite doubles as null instead of failing the whole report.</summary>
    private sealed class FiniteDoubleConverter : JsonConverter<double>
    {
        public override bool HandleNull => true;

        public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options) =>
            reader.TokenType == JsonTokenType.Null ? double.NaN : reader.GetDouble();

        public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
        {
            if (double.IsFinite(value)) writer.WriteNumberValue(value);
            else writer.WriteNullValue();
        }
    }
}
