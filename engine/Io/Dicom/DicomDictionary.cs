using System.Globalization;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>One data dictionary entry (PS3.6): keyword, VR, VM and whether it is retired.</summary>
public sealed record DictionaryEntry(string Keyword, DicomVR VR, string VM, bool Retired)
{
    /// <summary>PS3.6 lists "US or SS": SS when Pixel Representation is 1 (the dictionary VR is US).</summary>
    public bool UsOrSs { get; init; }
}

/// <summary>Which numbers of a repeating range are valid.</summary>
internal enum RangeParity { All, Even, Odd }

/// <summary>A repeating-group or element range entry (e.g. overlays 60xx, private creators).</summary>
internal sealed record DictionaryRange(ushort GroupLow, ushort GroupHigh, RangeParity GroupParity,
    ushort ElementLow, ushort ElementHigh, RangeParity ElementParity, DictionaryEntry Entry)
{
    public bool Matches(DicomTag tag) =>
        In(tag.Group, GroupLow, GroupHigh, GroupParity) && In(tag.Element, ElementLow, ElementHigh, ElementParity);

    private static bool In(ushort v, ushort lo, ushort hi, RangeParity p) =>
        v >= lo && v <= hi && (p == RangeParity.All || (p == RangeParity.Even) == ((v & 1) == 0));
}

/// <summary>
/// The DICOM data dictionary (PS3.6), generated from dcmtk's <c>dicom.dic</c> by
/// <c>tools/gen-dicom-dictionary.py</c>. Used to find VRs when reading Implicit VR data sets.
/// </summary>
internal static partial class DicomDictionary
{
    private static readonly Lazy<Dictionary<uint, DictionaryEntry>> Singles = new(ParseSingles);
    private static readonly Lazy<Dictionary<string, DicomTag>> ByKeyword = new(BuildKeywords);

    /// <summary>The entry of a tag; group lengths (gggg,0000) are UL (PS3.5 7.2); null when unknown.</summary>
    public static DictionaryEntry? Lookup(DicomTag tag)
    {
        if (Singles.Value.TryGetValue(tag.Value, out var e)) return e;
        if (tag.Element == 0) return GroupLength;
        foreach (var r in RangeEntries)
            if (r.Matches(tag)) return r.Entry;
        return null;
    }

    /// <summary>The tag of a PS3.6 keyword, if known.</summary>
    public static bool TryFindKeyword(string keyword, out DicomTag tag) => ByKeyword.Value.TryGetValue(keyword, out tag);

    private static readonly DictionaryEntry GroupLength = new("GenericGroupLength", DicomVR.UL, "1", false);

    private static Dictionary<uint, DictionaryEntry> ParseSingles()
    {
        var d = new Dictionary<uint, DictionaryEntry>(5000);
        var text = SingleEntries.AsSpan();
        while (!text.IsEmpty)
        {
            var eol = text.IndexOf('\n');
            var line = eol < 0 ? text : text[..eol];
            text = eol < 0 ? [] : text[(eol + 1)..];
            if (line.Length < 14) continue;
            // "GGGGEEEE VR VM Keyword[ R]"
            var tag = uint.Parse(line[..8], NumberStyles.HexNumber, CultureInfo.InvariantCulture);
            var vrText = line.Slice(9, 2);
            var rest = line[12..];
            var vmEnd = rest.IndexOf(' ');
            var vm = rest[..vmEnd].ToString();
            var name = rest[(vmEnd + 1)..];
            var retired = name.EndsWith(" R");
            if (retired) name = name[..^2];
            var usOrSs = vrText.SequenceEqual("xs");
            var vr = usOrSs ? DicomVR.US : vrText.SequenceEqual("na") ? DicomVR.None : (DicomVR)((vrText[0] << 8) | vrText[1]);
            d[tag] = new DictionaryEntry(name.ToString(), vr, vm, retired) { UsOrSs = usOrSs };
        }
        return d;
    }

    private static Dictionary<string, DicomTag> BuildKeywords()
    {
        var d = new Dictionary<string, DicomTag>(5000, StringComparer.Ordinal);
        foreach (var (tag, e) in Singles.Value)
            if (!d.TryGetValue(e.Keyword, out var existing) || (Singles.Value[existing.Value].Retired && !e.Retired))
                d[e.Keyword] = DicomTag.FromValue(tag);
        return d;
    }
}
