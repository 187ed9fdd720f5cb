using System.Text;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Decodes text of the VRs affected by Specific Character Set (0008,0005), PS3.3 C.12.1.1.2 and
/// PS3.5 section 6.1. Single-byte sets map to their ISO 8859 / Windows code pages, ISO_IR 192 to
/// UTF-8, GB18030/GBK to their code pages. Code extension (ISO 2022 escape sequences) is not
/// interpreted: the first set is used and the leniency recorded.
/// </summary>
public sealed class DicomCharacterSet
{
    private DicomCharacterSet(string term, Encoding encoding)
    {
        Term = term;
        Encoding = encoding;
    }

    /// <summary>The default repertoire (ISO-IR 6); bytes above 7FH are decoded as Latin-1 rather than lost.</summary>
    public static DicomCharacterSet Default { get; } = new("", Encoding.Latin1);

    /// <summary>The defined term(s) of (0008,0005), backslash-separated.</summary>
    public string Term { get; }

    /// <summary>The .NET encoding used to decode text.</summary>
    public Encoding Encoding { get; }

    /// <summary>Decodes text of a charset-affected VR.</summary>
    public string Decode(ReadOnlySpan<byte> bytes) => Encoding.GetString(bytes);

    /// <summary>Builds the character set of the defined terms in (0008,0005); unknown terms fall back to Latin-1 with a leniency.</summary>
    internal static DicomCharacterSet FromTerms(string raw, Action<string> lenient)
    {
        var terms = raw.Split('\\').Select(t => t.Trim()).ToArray();
        var first = terms.FirstOrDefault(t => t.Length > 0) ?? "";
        if (terms.Length > 1)
            lenient($"Specific Character Set '{raw}' uses ISO 2022 code extensions; escape sequences are not interpreted, text decoded as {first}");
        var cp = CodePageOf(first);
        if (cp is null)
        {
            lenient($"Specific Character Set '{raw}' is not supported; text decoded as Latin-1");
            return new DicomCharacterSet(raw, Encoding.Latin1);
        }
        return new DicomCharacterSet(raw, EncodingOf(cp.Value));
    }

    private static Encoding EncodingOf(int codePage) => codePage switch
    {
        20127 or 28591 => Encoding.Latin1,
        65001 => new UTF8Encoding(false, false),
        _ => CodePagesEncodingProvider.Instance.GetEncoding(codePage) ?? Encoding.Latin1,
    };

    /// <summary>Code page of a defined term of PS3.3 tables C.12-2 to C.12-5.</summary>
    private static int? CodePageOf(string term) => term.Replace("ISO 2022 ", "ISO_", StringComparison.Ordinal) switch
    {
        "" or "ISO_IR 6" or "ISO_IR6" => 20127,
        "ISO_IR 100" => 28591,
        "ISO_IR 101" => 28592,
        "ISO_IR 109" => 28593,
        "ISO_IR 110" => 28594,
        "ISO_IR 144" => 28595,
        "ISO_IR 127" => 28596,
        "ISO_IR 126" => 28597,
        "ISO_IR 138" => 28598,
        "ISO_IR 148" => 28599,
        "ISO_IR 203" => 28605,
        "ISO_IR 166" => 874,
        "ISO_IR 13" => 932,
        "ISO_IR 192" => 65001,
        "GB18030" => 54936,
        "GBK" => 936,
        _ => null,
    };
}
