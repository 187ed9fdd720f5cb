using System.Text.Json.Nodes;
using Serimetry.Api.Hosting;
using Serimetry.Engine.Core;

namespace Serimetry.Api.Jobs;

/// <summary>
/// Engine input errors name the command-line options of <c>serimetry compare</c> in their text; a comparison that
/// failed in the service speaks of the fields of its request (<c>POST /v1/comparisons</c>) instead.
/// </summary>
internal static class ServiceTerms
{
    // Longest first, so "--followup EXAM" is replaced before "--followup".
    private static readonly (string Cli, string Service)[] Terms =
    [
        ("--allow-different-patients", "\"options\": {\"allowDifferentPatients\": true}"),
        ("--followup EXAM", "a study id in followupStudyIds"),
        ("--gland MASK", "glandMaskId (a mask uploaded with POST /v1/masks)"),
        ("--lesion MASK", "lesionMaskId (a mask uploaded with POST /v1/masks)"),
        ("--baseline", "baselineStudyId"),
        ("--followup", "followupStudyIds"),
        ("--gland", "glandMaskId"),
        ("--lesion", "lesionMaskId"),
        ("--psa", "psa"),
    ];

    /// <summary>The problem document of an engine input error, worded for the service's request fields.</summary>
    public static JsonObject Problem(InputException e)
    {
        var doc = Problems.FromInput(e);
        foreach (var field in new[] { "detail", "fix" })
            if (doc[field] is JsonValue v && v.TryGetValue(out string? text)) doc[field] = Rephrase(text);
        return doc;
    }

    /// <summary><paramref name="text"/> with every command-line option of compare replaced by its request field.</summary>
    public static string Rephrase(string text)
    {
        foreach (var (cli, service) in Terms) text = text.Replace(cli, service, StringComparison.Ordinal);
        return text;
    }
}
