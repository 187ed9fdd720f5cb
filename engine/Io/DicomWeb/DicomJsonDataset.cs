using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// One data set in the DICOM JSON Model (PS3.18 annex F.2): an object whose keys are tags as eight upper-case
/// hex digits, each holding <c>{"vr": "XX", "Value": [...]}</c> (or <c>BulkDataURI</c> / <c>InlineBinary</c>
/// instead of <c>Value</c>). Person names are objects with an <c>Alphabetic</c> component group (F.2.2);
/// sequences hold nested data sets. Values are converted on demand.
/// </summary>
public sealed class DicomJsonDataset
{
    private readonly Dictionary<uint, JsonElement> _attributes;

    private DicomJsonDataset(Dictionary<uint, JsonElement> attributes) => _attributes = attributes;

    /// <summary>Parses a JSON array of data sets (a QIDO-RS response, PS3.18 10.6.3.3.1).</summary>
    public static IReadOnlyList<DicomJsonDataset> ParseArray(ReadOnlySpan<byte> json, string where)
    {
        var root = ParseRoot(json, where);
        if (root.ValueKind != JsonValueKind.Array) throw Bad(where, $"expected a JSON array of data sets, found {root.ValueKind}");
        return root.EnumerateArray().Select(e => FromElement(e, where)).ToList();
    }

    /// <summary>Parses one data set (a STOW-RS response, PS3.18 10.5.3), also when a server wraps it in a one-item array.</summary>
    public static DicomJsonDataset ParseOne(ReadOnlySpan<byte> json, string where)
    {
        var root = ParseRoot(json, where);
        if (root.ValueKind == JsonValueKind.Array)
            return root.GetArrayLength() == 1 ? FromElement(root[0], where) : throw Bad(where, $"expected one data set, found {root.GetArrayLength()}");
        return FromElement(root, where);
    }

    private static JsonElement ParseRoot(ReadOnlySpan<byte> json, string where)
    {
        try
        {
            var reader = new Utf8JsonReader(json, new JsonReaderOptions { MaxDepth = 64 });
            return JsonElement.ParseValue(ref reader);
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"the DICOM JSON answer is not valid JSON ({e.Message})", where,
                "the server's answer does not follow PS3.18 F.2; check the server", e);
        }
    }

    /// <summary>Parses one data set object (PS3.18 F.2.1).</summary>
    public static DicomJsonDataset FromElement(JsonElement element, string where)
    {
        if (element.ValueKind != JsonValueKind.Object) throw Bad(where, $"expected a data set object, found {element.ValueKind}");
        var attrs = new Dictionary<uint, JsonElement>();
        foreach (var p in element.EnumerateObject())
        {
            if (p.Name.Length != 8 || !uint.TryParse(p.Name, NumberStyles.AllowHexSpecifier, CultureInfo.InvariantCulture, out var tag))
                throw Bad(where, $"attribute key '{p.Name}' is not a tag of eight hex digits (F.2.1.1)");
            if (p.Value.ValueKind != JsonValueKind.Object
                || !p.Value.TryGetProperty("vr", out var vr) || vr.ValueKind != JsonValueKind.String || vr.GetString()!.Length != 2)
                throw Bad(where, $"attribute {p.Name} has no two-letter \"vr\" (F.2.3)");
            attrs[tag] = p.Value;
        }
        return new DicomJsonDataset(attrs);
    }

    /// <summary>True when the data set has the attribute (with or without a value).</summary>
    public bool Contains(DicomTag tag) => _attributes.ContainsKey(tag.Value);

    /// <summary>The attribute's VR, or null when absent.</summary>
    public string? VrOf(DicomTag tag) => _attributes.TryGetValue(tag.Value, out var a) ? a.GetProperty("vr").GetString() : null;

    /// <summary>The values as text: strings as they are, numbers in invariant form, person names as their Alphabetic group.</summary>
    public IReadOnlyList<string> GetStrings(DicomTag tag)
    {
        if (!TryValues(tag, out var values)) return [];
        var list = new List<string>();
        foreach (var v in values.EnumerateArray())
        {
            list.Add(v.ValueKind switch
            {
                JsonValueKind.String => v.GetString()!,
                JsonValueKind.Number => v.GetRawText(),
                JsonValueKind.Object => v.TryGetProperty("Alphabetic", out var a) && a.ValueKind == JsonValueKind.String ? a.GetString()! : "",
                _ => "",
            });
        }
        return list;
    }

    /// <summary>The first value as text, or null.</summary>
    public string? GetString(DicomTag tag) => GetStrings(tag) is { Count: > 0 } s ? s[0] : null;

    /// <summary>The first value as an integer (IS, US, UL, SL, SS are numbers or numeric strings), or null.</summary>
    public long? GetInteger(DicomTag tag)
    {
        if (!TryValues(tag, out var values) || values.GetArrayLength() == 0) return null;
        var v = values[0];
        if (v.ValueKind == JsonValueKind.Number && v.TryGetInt64(out var n)) return n;
        if (v.ValueKind == JsonValueKind.String && long.TryParse(v.GetString(), NumberStyles.Integer, CultureInfo.InvariantCulture, out n)) return n;
        return null;
    }

    /// <summary>The items of a sequence (SQ) attribute; empty when absent or empty.</summary>
    public IReadOnlyList<DicomJsonDataset> GetSequence(DicomTag tag, string where = "DICOM JSON")
    {
        if (!TryValues(tag, out var values)) return [];
        return values.EnumerateArray().Select(e => FromElement(e, where)).ToList();
    }

    private bool TryValues(DicomTag tag, out JsonElement values)
    {
        values = default;
        return _attributes.TryGetValue(tag.Value, out var a) && a.TryGetProperty("Value", out values) && values.ValueKind == JsonValueKind.Array;
    }

    private static InputFormatException Bad(string where, string what) =>
        new($"malformed DICOM JSON: {what}", where, "the server's answer does not follow PS3.18 F.2; check the server");
}
