using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Codecs;

public class CodecRegistryTests
{
    [Theory]
    [InlineData("1.2.840.10008.1.2.5", typeof(RleLosslessDecoder))]
    [InlineData("1.2.840.10008.1.2.4.57", typeof(JpegLosslessDecoder))]
    [InlineData("1.2.840.10008.1.2.4.70", typeof(JpegLosslessDecoder))]
    [InlineData("1.2.840.10008.1.2.4.80", typeof(JpegLsDecoder))]
    public void LosslessSyntaxesHaveDecoders(string uid, Type expected)
    {
        // Src: DICOM PS3.6 Table A-1 (transfer syntax UIDs).
        Assert.IsType(expected, CodecRegistry.Require(uid));
    }

    [Theory]
    [InlineData("1.2.840.10008.1.2.4.90", "JPEG 2000")]
    [InlineData("1.2.840.10008.1.2.4.50", "JPEG Baseline")]
    [InlineData("1.2.3.4", "1.2.3.4")]
    public void OtherSyntaxesAreRefusedByName(string uid, string named)
    {
        Assert.Null(CodecRegistry.Find(uid));
        var error = Assert.Throws<UnsupportedInputException>(() => CodecRegistry.Require(uid, "IM0001.dcm"));
        Assert.Contains(named, error.Message);
        Assert.Contains(uid, error.Message);
        Assert.Contains("gdcmconv --raw", error.Fix);
    }
}
