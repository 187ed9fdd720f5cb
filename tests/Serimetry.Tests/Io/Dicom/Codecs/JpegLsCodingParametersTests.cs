using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Codecs;

public class JpegLsCodingParametersTests
{
    [Fact]
    public void EightBitDefaultsAre3_7_21_64()
    {
        // Src: dcmtk dcmcjpls --help ("default for 8 bpp: 3 / 7 / 21", reset 64), T.87 C.2.4.1.1.1.
        var p = JpegLsCodingParameters.Resolve(8, 0, 0, 0, 0, 0);
        Assert.Equal((255, 3, 7, 21, 64), (p.MaxVal, p.T1, p.T2, p.T3, p.Reset));
        Assert.Equal(32, p.Limit); // T.87 A.2.1: LIMIT = 2 (bpp + max(8, bpp)) = 32 for 8 bits
    }

    [Fact]
    public void SixteenBitDefaultsAre18_67_276()
    {
        // From memory (T.87 C.2.4.1.1.1 with FACTOR = (min(MAXVAL, 4095) + 128) / 256 = 16).
        var p = JpegLsCodingParameters.Resolve(16, 0, 0, 0, 0, 0);
        Assert.Equal((65535, 18, 67, 276), (p.MaxVal, p.T1, p.T2, p.T3));
        Assert.Equal(16, p.Qbpp);
        Assert.Equal(64, p.Limit);
    }

    [Fact]
    public void ThresholdsOutOfOrderAreRefused()
    {
        Assert.Throws<InputFormatException>(() => JpegLsCodingParameters.Resolve(8, 0, 30, 20, 10, 0));
        Assert.Throws<InputFormatException>(() => JpegLsCodingParameters.Resolve(8, 300, 0, 0, 0, 0));
    }
}
