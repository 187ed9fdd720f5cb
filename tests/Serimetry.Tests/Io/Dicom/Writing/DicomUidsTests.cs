using Serimetry.Engine.Io.Dicom.Writing;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Writing;

public sealed class DicomUidsTests
{
    [Fact]
    public void Uuid_derived_uids_are_valid_and_distinct()
    {
        // Src: PS3.5 B.2: "2.25." followed by the UUID as an unsigned decimal integer (< 2^128, no leading zero); PS3.5 9.1: ≤ 64 chars.
        var max = System.Numerics.BigInteger.Pow(2, 128);
        var seen = new HashSet<string>();
        for (int i = 0; i < 200; i++)
        {
            var uid = DicomUids.New();
            Assert.True(DicomUids.IsValid(uid), uid);
            Assert.StartsWith("2.25.", uid, StringComparison.Ordinal);
            Assert.True(System.Numerics.BigInteger.Parse(uid[5..], System.Globalization.CultureInfo.InvariantCulture) < max);
            Assert.True(seen.Add(uid));
        }
        Assert.True(DicomUids.IsValid(DicomUids.ImplementationClassUid));
    }

    [Fact]
    public void Named_uids_repeat_and_respect_a_configured_root()
    {
        Assert.Equal(DicomUids.FromName("a"), DicomUids.FromName("a"));
        Assert.NotEqual(DicomUids.FromName("a"), DicomUids.FromName("b"));
        var root = "1.2.826.0.1.3680043.10.999";
        var uid = DicomUids.FromName("x", root);
        Assert.StartsWith(root + ".", uid, StringComparison.Ordinal);
        Assert.InRange(uid.Length, root.Length + 2, 64);
        Assert.True(DicomUids.IsValid(uid));
        // Src: PS3.5 9.1: no leading zeros in a component, digits only.
        Assert.False(DicomUids.IsValid("1.02.3"));
        Assert.False(DicomUids.IsValid("1..3"));
        Assert.Throws<ArgumentException>(() => DicomUids.New("1.2.x"));
        Assert.Throws<ArgumentException>(() => DicomUids.New("1.2.826.0.1.3680043.10.999.12345678901234567890")); // > 40: too little room
    }
}
