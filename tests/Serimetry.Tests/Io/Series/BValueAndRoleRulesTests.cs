using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Xunit;

namespace Serimetry.Tests.Io.Series;

public class BValueAndRoleRulesTests
{
    private static SliceHeader S() => new() { Source = new SliceSource("x.dcm") };

    // Src: (0019,100C) bytes and Sequence Names as dcmdump prints them for the PROSTATEx exams
    // (shared/reference/mr README: "34 30 30 20" = "400 ", "*ep_b400t").
    [Theory]
    [InlineData("400 ", 400)]
    [InlineData("50", 50)]
    [InlineData("0 ", 0)]
    [InlineData("1600", 1600)]
    public void SiemensPrivateTextParses(string text, double expected) =>
        Assert.Equal(expected, BValueRules.ParseSiemensText(text));

    [Theory]
    [InlineData("garbage")]
    [InlineData("")]
    [InlineData("-5")]
    [InlineData("1e9")]
    public void SiemensPrivateGarbageIsIgnored(string text) => Assert.Null(BValueRules.ParseSiemensText(text));

    [Theory]
    [InlineData("*ep_b400t", 400)]
    [InlineData("*ep_b50t", 50)]
    [InlineData("ep_b0", 0)]
    [InlineData("ep_b100t", 100)]
    [InlineData("ep_b1000#1", 1000)]
    public void SequenceNamePatternParses(string name, double expected) =>
        Assert.Equal(expected, BValueRules.ParseSequenceName(name));

    [Theory]
    [InlineData("*ep_b50_800")] // ADC and computed series of the same exams: not a b-value of the image
    [InlineData("ep_b0_800")]
    [InlineData("*tse2d1_25")]
    public void OtherSequenceNamesGiveNothing(string name) => Assert.Null(BValueRules.ParseSequenceName(name));

    [Fact]
    public void StandardAttributeWinsOverVendorFallbacks()
    {
        var s = S() with { DiffusionBValue = 800, SiemensBValueText = "400 ", SequenceName = "*ep_b50t" };
        var f = BValueRules.Find(s);
        Assert.Equal(800, f.BValue);
        Assert.Equal(BValueRules.StandardSource, f.Source);
        Assert.Equal(400, BValueRules.Find(s with { DiffusionBValue = null }).BValue);
        Assert.Equal(50, BValueRules.Find(s with { DiffusionBValue = null, SiemensBValueText = null }).BValue);
        Assert.Null(BValueRules.Find(S()).BValue);
    }

    // Attribute values as dcmdump shows them in the PROSTATEx exams (shared/reference/mr).
    private static SliceHeader Observed(string imageType, string description, string scanning, double tr, double te) =>
        S() with
        {
            ImageType = imageType.Split('\\'),
            SeriesDescription = description,
            ScanningSequence = scanning.Split('\\'),
            RepetitionTimeMs = tr,
            EchoTimeMs = te,
        };

    [Fact]
    public void RolesOfObservedSeries()
    {
        Assert.Equal(SeriesRole.T2w, RoleRules.Classify([Observed(@"ORIGINAL\PRIMARY\M\NORM\DIS2D", "t2_tse_tra", "SE", 5660, 104)]).Role);
        Assert.Equal(SeriesRole.Adc, RoleRules.Classify([Observed(@"DERIVED\PRIMARY\DIFFUSION\ADC\DIS2D", "ep2d_diff_tra_DYNDIST_ADC", "EP", 2700, 63)]).Role);
        var dwi = RoleRules.Classify([Observed(@"DERIVED\PRIMARY\DIFFUSION\TRACEW\DIS2D", "ep2d_diff_tra_DYNDIST", "EP", 2700, 63)]);
        Assert.Equal(SeriesRole.Dwi, dwi.Role);
        Assert.False(dwi.IsComputed);
        var calc = RoleRules.Classify([Observed(@"DERIVED\PRIMARY\DIFFUSION\TRACEW\ND", "ep2d-advdiff-3Scan-4bval_spair_511bCALC_BVAL", "EP", 3300, 60)]);
        Assert.Equal(SeriesRole.Dwi, calc.Role);
        Assert.True(calc.IsComputed);
    }

    [Fact]
    public void ShortEchoSpinEchoIsNotT2()
    {
        // Common practice: T1-weighted spin echo has a short TE (here 12 ms).
        Assert.Equal(SeriesRole.Other, RoleRules.Classify([Observed(@"ORIGINAL\PRIMARY\M", "t1_tse_tra", "SE", 600, 12)]).Role);
    }

    [Fact]
    public void DescriptionIsTheLastResort()
    {
        Assert.Equal(SeriesRole.T2w, RoleRules.Classify([S() with { SeriesDescription = "T2 AX" }]).Role);
        Assert.Equal(SeriesRole.Adc, RoleRules.Classify([S() with { SeriesDescription = "dwi_ADC" }]).Role);
        Assert.Equal(SeriesRole.Other, RoleRules.Classify([S()]).Role);
    }
}
