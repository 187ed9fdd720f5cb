using System.Globalization;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>A data element tag (group, element) as defined in DICOM PS3.5 section 7.1.</summary>
/// <param name="Group">Group number.</param>
/// <param name="Element">Element number.</param>
public readonly record struct DicomTag(ushort Group, ushort Element) : IComparable<DicomTag>
{
    /// <summary>Item (FFFE,E000), PS3.5 7.5.</summary>
    public static readonly DicomTag Item = new(0xFFFE, 0xE000);

    /// <summary>Item Delimitation Item (FFFE,E00D), PS3.5 7.5.</summary>
    public static readonly DicomTag ItemDelimitation = new(0xFFFE, 0xE00D);

    /// <summary>Sequence Delimitation Item (FFFE,E0DD), PS3.5 7.5.</summary>
    public static readonly DicomTag SequenceDelimitation = new(0xFFFE, 0xE0DD);

    /// <summary>The tag as one 32-bit number, group in the high half (sort order of PS3.5 7.1).</summary>
    public uint Value => ((uint)Group << 16) | Element;

    /// <summary>Private tags have an odd group number (PS3.5 7.8).</summary>
    public bool IsPrivate => (Group & 1) == 1 && Group > 0x0008;

    /// <summary>Private Creator elements (gggg,0010-00FF) of an odd group (PS3.5 7.8.1).</summary>
    public bool IsPrivateCreator => IsPrivate && Element >= 0x0010 && Element <= 0x00FF;

    /// <summary>Builds a tag from its 32-bit value.</summary>
    public static DicomTag FromValue(uint value) => new((ushort)(value >> 16), (ushort)value);

    /// <summary>Parses "(gggg,eeee)", "gggg,eeee" or "ggggeeee".</summary>
    public static DicomTag Parse(string text)
    {
        var t = text.Trim().TrimStart('(').TrimEnd(')').Replace(",", "", StringComparison.Ordinal);
        if (t.Length != 8 || !uint.TryParse(t, NumberStyles.HexNumber, CultureInfo.InvariantCulture, out var v))
            throw new FormatException($"'{text}' is not a DICOM tag (expected (gggg,eeee))");
        return FromValue(v);
    }

    public int CompareTo(DicomTag other) => Value.CompareTo(other.Value);

    /// <summary>The keyword from the data dictionary (PS3.6), or null.</summary>
    public string? Keyword => DicomDictionary.Lookup(this)?.Keyword;

    public override string ToString() => $"({Group:X4},{Element:X4})";
}
