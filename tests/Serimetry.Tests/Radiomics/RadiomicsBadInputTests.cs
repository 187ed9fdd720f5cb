using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>Bad input gives a clear error or the documented NaN policy (docs/radiomics.md), never a crash.</summary>
public sealed class RadiomicsBadInputTests
{
    private static (Volume<float>, Volume<byte>) Cube(int n, Func<int, int, int, float> value, Func<int, int, int, bool> inRoi)
    {
        var g = Geometry.Axial(new Size3(n, n, n), new Vec3(1, 1, 1), new Vec3(0, 0, 0));
        var image = new Volume<float>(g);
        var mask = new Volume<byte>(g);
        for (int k = 0; k < n; k++) for (int j = 0; j < n; j++) for (int i = 0; i < n; i++)
        {
            image[i, j, k] = value(i, j, k);
            mask[i, j, k] = inRoi(i, j, k) ? (byte)1 : (byte)0;
        }
        return (image, mask);
    }

    private static double Get(IReadOnlyList<FeatureValue> f, string code, string agg = IbsiAggregation.None) =>
        f.First(v => v.IbsiCode == code && v.AggregationCode == agg).Value;

    [Fact]
    public void Empty_roi_is_refused_with_a_clear_error()
    {
        var (image, mask) = Cube(4, (_, _, _) => 1, (_, _, _) => false);
        var e = Assert.Throws<InputFormatException>(() => RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings()));
        Assert.Contains("no voxel", e.Message);
    }

    [Fact]
    public void Mask_on_another_grid_is_refused()
    {
        var (image, _) = Cube(4, (_, _, _) => 1, (_, _, _) => true);
        var (_, mask) = Cube(5, (_, _, _) => 1, (_, _, _) => true);
        Assert.Throws<GeometryMismatchException>(() => RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings()));
    }

    [Fact]
    public void Single_voxel_roi_gives_defined_values_and_NaN_where_undefined()
    {
        var (image, mask) = Cube(5, (i, j, k) => i + j + k, (i, j, k) => i == 2 && j == 2 && k == 2);
        var f = RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings());
        Assert.Equal(1.0, Get(f, "YEKZ"), 12);           // one 1 mm³ voxel
        Assert.True(Get(f, "RNU0") > 0);                 // marching-cubes octahedron-like body
        Assert.Equal(0.0, Get(f, "ECT3"), 12);           // variance of one value
        Assert.Equal(6.0, Get(f, "Q4LE"), 12);
        Assert.True(double.IsNaN(Get(f, "GYBY", IbsiAggregation.ThreeDMerged)));   // no voxel pairs: NaN
        Assert.True(double.IsNaN(Get(f, "N365")));        // Moran's I needs two voxels
        Assert.Equal(1.0, Get(f, "P30P", IbsiAggregation.ThreeD), 12);             // one zone of one voxel
    }

    [Fact]
    public void Constant_intensities_fall_in_one_bin()
    {
        var (image, mask) = Cube(6, (_, _, _) => 42, (i, j, k) => i > 0 && j > 0 && k > 0 && i < 5 && j < 5 && k < 5);
        var f = RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings());
        Assert.Equal(0.0, Get(f, "KE2A"), 12);           // IBSI: skewness 0 when the variance is 0
        Assert.Equal(1.0, Get(f, "WIFQ"), 12);           // every voxel in bin 1
        Assert.Equal(1.0, Get(f, "GYBY", IbsiAggregation.ThreeDMerged), 12);       // all co-occurrences (1,1)
        Assert.Equal(0.0, Get(f, "TU9B", IbsiAggregation.ThreeDMerged), 12);
        Assert.True(double.IsNaN(Get(f, "NI2N", IbsiAggregation.ThreeDMerged)));   // correlation undefined
        Assert.Equal(1e6, Get(f, "QCDE", IbsiAggregation.ThreeD), 6);              // IBSI coarseness cap
    }

    [Fact]
    public void NaN_inside_the_roi_is_refused_by_default_and_dropped_on_request()
    {
        var (image, mask) = Cube(5, (i, j, k) => i == 2 && j == 2 && k == 2 ? float.NaN : 10 + i, (i, j, k) => i > 0 && i < 4 && j > 0 && j < 4 && k > 0 && k < 4);
        var e = Assert.Throws<InputFormatException>(() => RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings()));
        Assert.Contains("NaN", e.Message);
        var f = RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings { NonFiniteIntensities = NonFinitePolicy.Exclude });
        Assert.Equal(27.0, Get(f, "YEKZ"), 12);          // morphology keeps the voxel
        Assert.Equal(12.0, Get(f, "Q4LE"), 12);          // mean of the 26 finite values: (9·11 + 8·12 + 9·13)/26
        Assert.DoesNotContain(f, v => v.Family == FamilyNames.IntensityStatistics && double.IsNaN(v.Value));

        // Nothing finite left (NaN and ∞ alike): a clear error even when non-finite voxels are excluded.
        var (allBad, roi) = Cube(4, (i, _, _) => i % 2 == 0 ? float.NaN : float.PositiveInfinity, (_, _, _) => true);
        var none = Assert.Throws<InputFormatException>(() => RadiomicsExtractor.Extract(allBad, roi,
            new RadiomicsSettings { NonFiniteIntensities = NonFinitePolicy.Exclude }));
        Assert.Contains("every ROI voxel", none.Message);
    }

    [Fact]
    public void Bad_settings_are_refused()
    {
        var (image, mask) = Cube(4, (i, _, _) => i, (_, _, _) => true);
        Assert.Throws<InvalidParameterException>(() => RadiomicsExtractor.Extract(image, mask,
            new RadiomicsSettings { Discretisation = new DiscretisationSettings { BinCount = 0 } }));
        Assert.Throws<InvalidParameterException>(() => RadiomicsExtractor.Extract(image, mask,
            new RadiomicsSettings { Resegmentation = new ResegmentationSettings { RangeMin = 100 } }));
        // 30,001 bins of width 1e-4 over intensities 0..3 would need a 30,001² GLCM: refused, not allocated.
        Assert.Throws<InvalidParameterException>(() => RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings
        {
            Discretisation = new DiscretisationSettings { Method = DiscretisationMethod.FixedBinSize, BinWidth = 1e-4 },
        }));
        Assert.Throws<InvalidParameterException>(() => RadiomicsSettingsJson.Parse("{\"binz\": 3}", "test.json"));
        Assert.Throws<InvalidParameterException>(() => RadiomicsSettingsJson.Parse("{\"discretisation\": ", "test.json"));
    }
}
