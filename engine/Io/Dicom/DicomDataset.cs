using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// A data set (PS3.5 section 7): elements in stream order, with typed converters applied on demand.
/// Item data sets of sequences inherit byte order and Specific Character Set from their parent
/// unless they define their own (PS3.5 7.5, PS3.3 C.12.1.1.2).
/// </summary>
public sealed class DicomDataset
{
    private readonly List<DicomElement> _elements = [];
    private readonly Dictionary<uint, int> _index = [];
    private DicomCharacterSet? _charset;

    internal DicomDataset(bool bigEndian, DicomDataset? parent, DicomReadLog? log)
    {
        BigEndian = bigEndian;
        Parent = parent;
        Log = log;
    }

    /// <summary>Creates an empty little-endian data set (for tests and writers).</summary>
    public DicomDataset() : this(false, null, null) { }

    /// <summary>The elements in the order they were read.</summary>
    public IReadOnlyList<DicomElement> Elements => _elements;

    /// <summary>Values of binary VRs are big endian (Explicit VR Big Endian, PS3.5 A.3).</summary>
    public bool BigEndian { get; }

    /// <summary>The data set holding the sequence this item belongs to; null at top level.</summary>
    public DicomDataset? Parent { get; }

    internal DicomReadLog? Log { get; }

    /// <summary>The input this data set came from, for error locations.</summary>
    public string Where => Log?.Source ?? "DICOM data set";

    /// <summary>Deviations the reader accepted (empty in strict mode); shared with the whole file.</summary>
    public IReadOnlyList<string> Leniencies => Log?.Items ?? [];

    /// <summary>The Specific Character Set in force (own (0008,0005), else the parent's, else default).</summary>
    public DicomCharacterSet CharacterSet => _charset ??= ResolveCharacterSet();

    internal void Add(DicomElement e)
    {
        if (_index.TryAdd(e.Tag.Value, _elements.Count)) _elements.Add(e);
        else
        {
            Log?.Lenient($"element {e.Tag} occurs twice in one data set; the first is kept");
        }
    }

    /// <summary>True when the element is present (possibly empty).</summary>
    public bool Contains(DicomTag tag) => _index.ContainsKey(tag.Value);

    /// <summary>The raw element, or null.</summary>
    public DicomElement? Find(DicomTag tag) => _index.TryGetValue(tag.Value, out var i) ? _elements[i] : null;

    /// <summary>The raw element; throws <see cref="InputFormatException"/> when absent.</summary>
    public DicomElement Get(DicomTag tag) => Find(tag) ?? throw Missing(tag);

    /// <summary>The whole value as text (charset aware, trailing padding removed; numbers formatted, '\'-joined).</summary>
    public string GetString(DicomTag tag) => DicomValueConverter.Text(Get(tag), this);

    /// <summary>Value number <paramref name="index"/> (0-based) as text.</summary>
    public string GetString(DicomTag tag, int index) => At(GetStrings(tag), index, tag);

    /// <summary>The text, or null when absent.</summary>
    public string? GetStringOrNull(DicomTag tag) => Find(tag) is { } e ? DicomValueConverter.Text(e, this) : null;

    /// <summary>True and the text when present.</summary>
    public bool TryGetString(DicomTag tag, out string value)
    {
        value = GetStringOrNull(tag) ?? "";
        return Contains(tag);
    }

    /// <summary>
    /// The raw value bytes decoded as text in the data set's character set whatever the VR, trailing
    /// spaces and NULs removed; for private elements that hold text but are stored as OB or UN.
    /// Null when absent.
    /// </summary>
    public string? GetText(DicomTag tag) =>
        Find(tag) is { } e ? CharacterSet.Decode(e.Value.Span).TrimEnd(' ', '\0') : null;

    /// <summary>All values as text, split on backslash and trimmed (LT, ST, UT, UR are single-valued).</summary>
    public string[] GetStrings(DicomTag tag) => DicomValueConverter.Texts(Get(tag), this);

    /// <summary>Value number <paramref name="index"/> as an integer (IS, US, SS, UL, SL, SV, UV, AT …).</summary>
    public int GetInt(DicomTag tag, int index = 0) => ToInt(At(GetLongs(tag), index, tag), tag);

    /// <summary>All values as integers.</summary>
    public int[] GetInts(DicomTag tag) => Array.ConvertAll(GetLongs(tag), v => ToInt(v, tag));

    /// <summary>All values as 64-bit integers.</summary>
    public long[] GetLongs(DicomTag tag) => DicomValueConverter.Integers(Get(tag), this);

    /// <summary>The first integer, or null when absent or empty.</summary>
    public int? GetIntOrNull(DicomTag tag) => TryGetInt(tag, out var v) ? v : null;

    /// <summary>True and the first integer when present with a value.</summary>
    public bool TryGetInt(DicomTag tag, out int value)
    {
        value = 0;
        if (Find(tag) is not { } e) return false;
        var v = DicomValueConverter.Integers(e, this);
        if (v.Length == 0) return false;
        value = ToInt(v[0], tag);
        return true;
    }

    /// <summary>Value number <paramref name="index"/> as a real (DS, FL, FD, IS and integer VRs).</summary>
    public double GetDouble(DicomTag tag, int index = 0) => At(GetDoubles(tag), index, tag);

    /// <summary>All values as reals.</summary>
    public double[] GetDoubles(DicomTag tag) => DicomValueConverter.Reals(Get(tag), this);

    /// <summary>The first real, or null when absent or empty.</summary>
    public double? GetDoubleOrNull(DicomTag tag) => TryGetDouble(tag, out var v) ? v : null;

    /// <summary>True and the first real when present with a value.</summary>
    public bool TryGetDouble(DicomTag tag, out double value)
    {
        value = 0;
        if (Find(tag) is not { } e) return false;
        var v = DicomValueConverter.Reals(e, this);
        if (v.Length == 0) return false;
        value = v[0];
        return true;
    }

    /// <summary>All values as reals, or null when absent.</summary>
    public double[]? GetDoublesOrNull(DicomTag tag) => Find(tag) is { } e ? DicomValueConverter.Reals(e, this) : null;

    /// <summary>All values as text, or null when absent.</summary>
    public string[]? GetStringsOrNull(DicomTag tag) => Find(tag) is { } e ? DicomValueConverter.Texts(e, this) : null;

    /// <summary>The items of a sequence; empty when absent or when the element is not a sequence.</summary>
    public IReadOnlyList<DicomDataset> GetSequence(DicomTag tag) => Find(tag)?.Items ?? [];

    /// <summary>True and the items when the sequence is present.</summary>
    public bool TryGetSequence(DicomTag tag, out IReadOnlyList<DicomDataset> items)
    {
        items = Find(tag)?.Items ?? [];
        return Find(tag)?.Items is not null;
    }

    /// <summary>The raw value bytes (in the data set's byte order).</summary>
    public ReadOnlyMemory<byte> GetBytes(DicomTag tag) => Get(tag).Value;

    private DicomCharacterSet ResolveCharacterSet()
    {
        if (Find(DicomTags.SpecificCharacterSet) is { } e && e.Value.Length > 0)
        {
            var raw = System.Text.Encoding.Latin1.GetString(e.Value.Span).TrimEnd(' ', '\0');
            return DicomCharacterSet.FromTerms(raw, s => Log?.Lenient(s));
        }
        return Parent?.CharacterSet ?? DicomCharacterSet.Default;
    }

    private int ToInt(long v, DicomTag tag) => v is >= int.MinValue and <= int.MaxValue
        ? (int)v
        : throw new InputFormatException($"{DescribeTag(tag)} value {v} does not fit a 32-bit integer", Where,
            "the value is out of range; check the file is not corrupt");

    private T At<T>(T[] values, int index, DicomTag tag)
    {
        if (index >= 0 && index < values.Length) return values[index];
        throw new InputFormatException(
            $"{DescribeTag(tag)} has {values.Length} value(s); value {index + 1} was expected", Where,
            "the file lacks a required value; re-export it from the source system");
    }

    private InputFormatException Missing(DicomTag tag) =>
        new($"required attribute {DescribeTag(tag)} is missing", Where,
            "the file lacks a required attribute; check it is an image of the expected kind");

    private static string DescribeTag(DicomTag tag) => tag.Keyword is { } k ? $"{k} {tag}" : tag.ToString();
}
