using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Imaging;

public class IntensityStatisticsTests
{
    // Src: IBSI 1 digital phantom (shared/reference/ibsi/README.md): inside the ROI 74 voxels, mean 2.1486,
    // population variance 3.0455 (IBSI reference values 2.15 and 3.05); grey levels 1..6 in the ROI, 9 outside it.
    [Fact]
    public void IbsiPhantomRoiStatisticsMatchThePublishedValues()
    {
        var dir = SharedReference.PathOf("ibsi", "digital_phantom", "nifti");
        var image = NiftiFile.Read(Path.Combine(dir, "image", "phantom.nii.gz")).Volume;
        var mask = NiftiFile.ReadMask(Path.Combine(dir, "mask", "mask.nii.gz"));
        var s = IntensityStatistics.Summarize(image, mask);
        Assert.Equal(74, s.Count);
        Assert.Equal(2.1486, s.Mean, 4);
        Assert.Equal(3.0455, s.Variance, 4);
        Assert.Equal(1, s.Min);
        Assert.Equal(6, s.Max);
        Assert.Equal(9, IntensityStatistics.Summarize(image).Max);
    }

    // Src: common practice (Welford/Chan merges equal a two-pass computation; large offsets do not cancel).
    [Fact]
    public void LargeOffsetValuesKeepTheirVarianceAndNaNsAreCounted()
    {
        var g = Geometry.Axial(new Size3(100, 100, 30), new Vec3(1, 1, 1), Vec3.Zero);
        var v = new Volume<float>(g);
        var rng = new Random(3);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = 100000f + (float)Math.Round(rng.NextDouble() * 64) / 8f;
        v.Voxels[17] = float.NaN;
        double sum = 0, n = 0;
        foreach (var x in v.Voxels) if (!float.IsNaN(x)) { sum += x; n++; }
        double mean = sum / n, ss = 0;
        foreach (var x in v.Voxels) if (!float.IsNaN(x)) ss += (x - mean) * (x - mean);
        var s = IntensityStatistics.Summarize(v);
        Assert.Equal(1, s.NaNCount);
        Assert.Equal(n, s.Count);
        Assert.Equal(mean, s.Mean, 6);
        Assert.Equal(ss / n, s.Variance, 6);
        var labelled = new Volume<byte>(g);
        labelled.Voxels[5] = 2;
        labelled.Voxels[6] = 3;
        var one = IntensityStatistics.Summarize(v, labelled, 2);
        Assert.Equal(1, one.Count);
        Assert.Equal(v.Voxels[5], one.Mean);
        Assert.Equal(0, IntensityStatistics.Summarize(v, new Volume<byte>(g)).Count);
    }
}
