using System.Text;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>
/// A parsed Content-Type value (RFC 9110 8.3: <c>type "/" subtype *( OWS ";" OWS name "=" value )</c>, where a
/// value is a token or a quoted string with backslash escapes). Names are case-insensitive; the media type is
/// lower-cased; parameter values keep their case (a multipart boundary is case-sensitive, RFC 2046 5.1.1).
/// </summary>
public sealed record MimeContentType(string MediaType, IReadOnlyDictionary<string, string> Parameters)
{
    /// <summary>A parameter's value, or null.</summary>
    public string? this[string name] => Parameters.TryGetValue(name, out var v) ? v : null;

    /// <summary>Parses a Content-Type value; malformed text is an <see cref="InputFormatException"/> naming <paramref name="where"/>.</summary>
    public static MimeContentType Parse(string text, string where)
    {
        ArgumentNullException.ThrowIfNull(text);
        int i = 0;
        string type = Token(text, ref i, where);
        if (i >= text.Length || text[i] != '/') throw Bad(text, where, "no '/' between type and subtype");
        i++;
        string subtype = Token(text, ref i, where);
        var parameters = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
        while (true)
        {
            SkipSpace(text, ref i);
            if (i >= text.Length) break;
            if (text[i] != ';') throw Bad(text, where, $"unexpected '{text[i]}' at position {i}");
            i++;
            SkipSpace(text, ref i);
            if (i >= text.Length) break; // a trailing ';' is tolerated
            string name = Token(text, ref i, where);
            if (i >= text.Length || text[i] != '=') throw Bad(text, where, $"parameter '{name}' has no value");
            i++;
            string value = i < text.Length && text[i] == '"' ? Quoted(text, ref i, where) : Token(text, ref i, where);
            parameters[name] = value;
        }
        return new MimeContentType((type + "/" + subtype).ToLowerInvariant(), parameters);
    }

    private static string Token(string s, ref int i, string where)
    {
        int start = i;
        while (i < s.Length && IsTokenChar(s[i])) i++;
        if (i == start) throw Bad(s, where, $"expected a token at position {start}");
        return s[start..i];
    }

    private static string Quoted(string s, ref int i, string where)
    {
        var sb = new StringBuilder();
        for (i++; i < s.Length; i++)
        {
            char c = s[i];
            if (c == '"')
            {
                i++;
                return sb.ToString();
            }
            if (c == '\\')
            {
                if (++i >= s.Length) break;
                c = s[i];
            }
            sb.Append(c);
        }
        throw Bad(s, where, "a quoted value is not closed");
    }

    private static void SkipSpace(string s, ref int i)
    {
        while (i < s.Length && s[i] is ' ' or '\t') i++;
    }

    // RFC 9110 5.6.2 tchar.
    private static bool IsTokenChar(char c) =>
        c is > ' ' and < (char)127 && "()<>@,;:\\\"/[]?={}".IndexOf(c) < 0;

    private static InputFormatException Bad(string text, string where, string what) =>
        new($"malformed Content-Type '{text}': {what}", where, "the server's response does not follow RFC 9110; check the server");
}
