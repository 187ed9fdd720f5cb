using System.Numerics;
using System.Security.Cryptography;
using System.Text;

namespace Serimetry.Engine.Io.Dicom.Writing;

/// <summary>
/// UID generation (PS3.5 section 9 and annex B). Default root <c>2.25</c>: a UUID as one decimal
/// integer (PS3.5 B.2, ITU-T X.667). With a registered organisation root, UIDs are that root followed by
/// a decimal integer derived from 128 random (or hashed) bits, cut so that the UID stays within 64 characters.
/// </summary>
public static class DicomUids
{
    /// <summary>The UUID-derived root of PS3.5 B.2.</summary>
    public const string UuidRoot = "2.25";

    /// <summary>
    /// Implementation Class UID (0002,0012) of Serimetry: a fixed UUID-derived UID (PS3.5 B.2) since the
    /// project has no registered root; PS3.7 D.3.3.2 asks only that it be unique to the implementation.
    /// </summary>
    public const string ImplementationClassUid = "2.25.151466289458063390233346203386226738517";

    /// <summary>Implementation Version Name (0002,0013), at most 16 characters.</summary>
    public static string ImplementationVersionName => ("SERIMETRY_" + SoftwareInfo.Version).Length <= 16
        ? "SERIMETRY_" + SoftwareInfo.Version : "SERIMETRY";

    /// <summary>A new random UID under <paramref name="root"/> (default 2.25).</summary>
    public static string New(string root = UuidRoot) => Under(root, RandomNumberGenerator.GetBytes(16));

    /// <summary>
    /// A repeatable UID under <paramref name="root"/> from a name (SHA-256 of the text, first 128 bits;
    /// in the spirit of name-based UUIDs, RFC 4122 section 4.3): same input, same UID — phantoms re-created
    /// from the same spec and seed get identical files.
    /// </summary>
    public static string FromName(string name, string root = UuidRoot) =>
        Under(root, SHA256.HashData(Encoding.UTF8.GetBytes(name))[..16]);

    /// <summary>Checks a UID against PS3.5 9.1: components of digits without leading zeros, at most 64 characters.</summary>
    public static bool IsValid(string uid)
    {
        if (string.IsNullOrEmpty(uid) || uid.Length > 64) return false;
        foreach (var part in uid.Split('.'))
        {
            if (part.Length == 0 || (part.Length > 1 && part[0] == '0')) return false;
            foreach (var c in part) if (c is < '0' or > '9') return false;
        }
        return true;
    }

    private static string Under(string root, byte[] bits)
    {
        if (!IsValid(root) || root.Length > 40)
            throw new ArgumentException($"UID root '{root}' is not a valid UID prefix of at most 40 characters (PS3.5 9.1)", nameof(root));
        var n = new BigInteger(bits, isUnsigned: true, isBigEndian: true);
        var digits = n.ToString(System.Globalization.CultureInfo.InvariantCulture);
        int room = 64 - root.Length - 1;
        if (digits.Length > room) digits = digits[..room].TrimStart('0');
        if (digits.Length == 0) digits = "0";
        return root + "." + digits;
    }
}
