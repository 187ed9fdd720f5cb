using System.Text.Json;
using System.Text.Json.Serialization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Radiomics;

/// <summary>Reads and writes <see cref="RadiomicsSettings"/> as JSON (camelCase, enums as names, unknown fields refused).</summary>
public static class RadiomicsSettingsJson
{
    private static readonly JsonSerializerOptions Options = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        WriteIndented = true,
        UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
        ReadCommentHandling = JsonCommentHandling.Skip,
        AllowTrailingCommas = true,
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
    };

    /// <summary>Parses settings; malformed JSON or unknown fields raise <see cref="InvalidParameterException"/> naming <paramref name="where"/>.</summary>
    public static RadiomicsSettings Parse(string json, string where)
    {
        try
        {
            return JsonSerializer.Deserialize<RadiomicsSettings>(json, Options)
                ?? throw new InvalidParameterException("settings are empty (null)", where, "supply a JSON object");
        }
        catch (JsonException e)
        {
            throw new InvalidParameterException($"radiomics settings are not valid: {e.Message}", where,
                "see docs/radiomics.md for the settings schema", e);
        }
    }

    public static string Serialize(RadiomicsSettings settings) => JsonSerializer.Serialize(settings, Options);
}
