using System.Security.Cryptography;
using System.Text;
using Serimetry.Api.Storage;

namespace Serimetry.Api.Security;

/// <summary>
/// API keys of the form <c>smk_&lt;id&gt;_&lt;secret&gt;</c>: the id finds the row, the 256-bit random secret is checked
/// against SHA-256(salt ‖ secret) with a per-key 16-byte salt. A fast hash suffices because the secret is random
/// with full entropy (no dictionary to attack, unlike passwords — NIST SP 800-63B §5.1.1.2 targets memorised secrets).
/// Comparison is constant-time.
/// </summary>
public static class ApiKeys
{
    private const string Prefix = "smk_";

    /// <summary>Creates a key named <paramref name="name"/>, stores its hash and returns the key text (shown once).</summary>
    public static string Create(MetadataStore store, string name)
    {
        if (string.IsNullOrWhiteSpace(name) || name.Length > 100)
            throw new ArgumentException("key name must be 1-100 characters", nameof(name));
        string id = Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(6));
        string secret = Base64Url(RandomNumberGenerator.GetBytes(32));
        byte[] salt = RandomNumberGenerator.GetBytes(16);
        store.AddKey(new KeyRecord(id, name.Trim(), salt, Hash(salt, secret)));
        return $"{Prefix}{id}_{secret}";
    }

    /// <summary>The key's name when <paramref name="presented"/> is a valid key, else null.</summary>
    public static string? Verify(MetadataStore store, string? presented)
    {
        if (presented is null || !presented.StartsWith(Prefix, StringComparison.Ordinal)) return null;
        var rest = presented[Prefix.Length..];
        int us = rest.IndexOf('_');
        if (us != 12) return null;
        var key = store.FindKey(rest[..us]);
        if (key is null) return null;
        return CryptographicOperations.FixedTimeEquals(key.Hash, Hash(key.Salt, rest[(us + 1)..])) ? key.Name : null;
    }

    private static byte[] Hash(byte[] salt, string secret)
    {
        var s = Encoding.UTF8.GetBytes(secret);
        var buf = new byte[salt.Length + s.Length];
        salt.CopyTo(buf, 0);
        s.CopyTo(buf, salt.Length);
        return SHA256.HashData(buf);
    }

    private static string Base64Url(byte[] b) => Convert.ToBase64String(b).TrimEnd('=').Replace('+', '-').Replace('/', '_');
}
