using System.Buffers.Binary;
using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// On-demand conversion of raw element values, one small converter per VR (PS3.5 section 6.2).
/// Binary values honour the byte order of the data set; text honours its Specific Character Set.
/// </summary>
internal static class DicomValueConverter
{
    /// <summary>The VR used to interpret a value: UN values of known tags take the dictionary VR (PS3.5 6.2.2 note).</summary>
    public static DicomVR EffectiveVR(DicomElement e)
    {
        if (e.VR != DicomVR.UN) return e.VR;
        var d = DicomDictionary.Lookup(e.Tag);
        return d is null || d.VR is DicomVR.SQ or DicomVR.None ? DicomVR.UN : d.VR;
    }

    /// <summary>The whole text of a string value, trailing padding removed.</summary>
    public static string Text(DicomElement e, DicomDataset ds)
    {
        var vr = EffectiveVR(e);
        if (!vr.IsString()) return string.Join('\\', NumbersAsText(e, ds, vr));
        var text = vr.UsesSpecificCharacterSet() ? ds.CharacterSet.Decode(e.Value.Span) : Ascii(e.Value.Span);
        return text.TrimEnd(' ', '\0');
    }

    /// <summary>The values of a string element, split on backslash (except LT, ST, UT, UR) and trimmed.</summary>
    public static string[] Texts(DicomElement e, DicomDataset ds)
    {
        var vr = EffectiveVR(e);
        if (!vr.IsString()) return NumbersAsText(e, ds, vr);
        var text = Text(e, ds);
        if (vr.IsSingleValuedText()) return text.Length == 0 ? [] : [text];
        if (text.Length == 0) return [];
        var parts = text.Split('\\');
        for (var i = 0; i < parts.Length; i++) parts[i] = parts[i].Trim(' ', '\0');
        return parts;
    }

    /// <summary>Integer values: IS text, or binary US, SS, UL, SL, SV, UV, AT, OB, OW, OL, OV.</summary>
    public static long[] Integers(DicomElement e, DicomDataset ds)
    {
        var vr = EffectiveVR(e);
        if (vr == DicomVR.IS || vr == DicomVR.DS)
            return Array.ConvertAll(Texts(e, ds), s => ParseInteger(s, e, ds));
        var size = vr.ValueSize();
        if (size == 0 || vr is DicomVR.FL or DicomVR.FD or DicomVR.OF or DicomVR.OD)
            throw NotConvertible(e, ds, "an integer");
        var span = e.Value.Span;
        var n = span.Length / size;
        var result = new long[n];
        for (var i = 0; i < n; i++) result[i] = ReadInteger(span.Slice(i * size, size), vr, ds.BigEndian);
        return result;
    }

    /// <summary>Real values: DS, IS text, or binary FL, FD, OF, OD and the integer VRs.</summary>
    public static double[] Reals(DicomElement e, DicomDataset ds)
    {
        var vr = EffectiveVR(e);
        if (vr == DicomVR.DS || vr == DicomVR.IS)
            return Array.ConvertAll(Texts(e, ds), s => ParseReal(s, e, ds));
        if (vr is DicomVR.FL or DicomVR.OF or DicomVR.FD or DicomVR.OD)
        {
            var span = e.Value.Span;
            var size = vr.ValueSize();
            var n = span.Length / size;
            var result = new double[n];
            for (var i = 0; i < n; i++)
            {
                var s = span.Slice(i * size, size);
                result[i] = size == 4
                    ? (ds.BigEndian ? BinaryPrimitives.ReadSingleBigEndian(s) : BinaryPrimitives.ReadSingleLittleEndian(s))
                    : (ds.BigEndian ? BinaryPrimitives.ReadDoubleBigEndian(s) : BinaryPrimitives.ReadDoubleLittleEndian(s));
            }
            return result;
        }
        return Array.ConvertAll(Integers(e, ds), v => (double)v);
    }

    private static long ReadInteger(ReadOnlySpan<byte> s, DicomVR vr, bool be) => vr switch
    {
        DicomVR.OB or DicomVR.UN => s[0],
        DicomVR.US or DicomVR.OW => be ? BinaryPrimitives.ReadUInt16BigEndian(s) : BinaryPrimitives.ReadUInt16LittleEndian(s),
        DicomVR.SS => be ? BinaryPrimitives.ReadInt16BigEndian(s) : BinaryPrimitives.ReadInt16LittleEndian(s),
        DicomVR.UL or DicomVR.OL => be ? BinaryPrimitives.ReadUInt32BigEndian(s) : BinaryPrimitives.ReadUInt32LittleEndian(s),
        DicomVR.SL => be ? BinaryPrimitives.ReadInt32BigEndian(s) : BinaryPrimitives.ReadInt32LittleEndian(s),
        DicomVR.AT => ReadAttributeTag(s, be),
        DicomVR.SV => be ? BinaryPrimitives.ReadInt64BigEndian(s) : BinaryPrimitives.ReadInt64LittleEndian(s),
        _ => (long)(be ? BinaryPrimitives.ReadUInt64BigEndian(s) : BinaryPrimitives.ReadUInt64LittleEndian(s)),
    };

    /// <summary>AT is a pair of 16-bit numbers, group first (PS3.5 6.2).</summary>
    private static long ReadAttributeTag(ReadOnlySpan<byte> s, bool be)
    {
        uint g = be ? BinaryPrimitives.ReadUInt16BigEndian(s) : BinaryPrimitives.ReadUInt16LittleEndian(s);
        uint el = be ? BinaryPrimitives.ReadUInt16BigEndian(s[2..]) : BinaryPrimitives.ReadUInt16LittleEndian(s[2..]);
        return (g << 16) | el;
    }

    private static string[] NumbersAsText(DicomElement e, DicomDataset ds, DicomVR vr)
    {
        if (vr is DicomVR.FL or DicomVR.FD or DicomVR.OF or DicomVR.OD)
            return Array.ConvertAll(Reals(e, ds), v => v.ToString("R", CultureInfo.InvariantCulture));
        if (vr == DicomVR.AT)
            return Array.ConvertAll(Integers(e, ds), v => DicomTag.FromValue((uint)v).ToString());
        if (vr.ValueSize() == 0) throw NotConvertible(e, ds, "text");
        return Array.ConvertAll(Integers(e, ds), v => v.ToString(CultureInfo.InvariantCulture));
    }

    private static long ParseInteger(string s, DicomElement e, DicomDataset ds)
    {
        if (long.TryParse(s, NumberStyles.Integer, CultureInfo.InvariantCulture, out var v)) return v;
        // Some writers put "12.0" into IS; accept integral reals.
        if (double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var d) && d == Math.Floor(d) && Math.Abs(d) < 9e15)
        {
            ds.Log?.Lenient($"{e.Tag} IS value '{s}' written as a real number");
            return (long)d;
        }
        throw new InputFormatException($"value '{s}' of {Describe(e)} is not an integer", ds.Where,
            "the file is malformed; re-export it from the source system");
    }

    private static double ParseReal(string s, DicomElement e, DicomDataset ds)
    {
        if (double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var v)) return v;
        throw new InputFormatException($"value '{s}' of {Describe(e)} is not a decimal number", ds.Where,
            "the file is malformed; re-export it from the source system");
    }

    private static string Ascii(ReadOnlySpan<byte> s) => System.Text.Encoding.Latin1.GetString(s);

    internal static string Describe(DicomElement e) =>
        $"{e.Tag}{(e.Tag.Keyword is { } k ? " " + k : "")} ({e.VR.Code()})";

    private static InputFormatException NotConvertible(DicomElement e, DicomDataset ds, string what) =>
        new($"{Describe(e)} cannot be read as {what}", ds.Where, "check the attribute and its VR");
}
