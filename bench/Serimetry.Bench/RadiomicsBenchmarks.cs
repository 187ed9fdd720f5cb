using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;

namespace Serimetry.Bench;

/// <summary>
/// All IBSI chapter 1 families on a ~50,000-voxel ellipsoidal ROI in a 384×384×24 volume
/// (0.5×0.5×3 mm, prostate-MRI-like), at 32 and 128 fixed bins; one benchmark per family shows the slowest.
/// </summary>
[MemoryDiagnoser]
public class RadiomicsBenchmarks
{
    private Volume<float> _image = null!;
    private Volume<byte> _mask = null!;

    [Params(32, 128)]
    public int Bins { get; set; }

    [GlobalSetup]
    public void Setup() => (_image, _mask) = Build();

    /// <summary>A textured image and an ellipsoid ROI of about 50,000 voxels.</summary>
    public static (Volume<float>, Volume<byte>) Build()
    {
        var g = Geometry.Axial(new Size3(384, 384, 24), new Vec3(0.5, 0.5, 3), new Vec3(0, 0, 0));
        var image = new Volume<float>(g);
        var mask = new Volume<byte>(g);
        var rng = new Random(1234);
        for (int k = 0; k < 24; k++)
        for (int j = 0; j < 384; j++)
        for (int i = 0; i < 384; i++)
        {
            double x = (i - 191.5) / 40.0, y = (j - 191.5) / 31.5, z = (k - 11.5) / 9.5;
            image[i, j, k] = (float)(500 + 200 * Math.Sin(i / 7.0) * Math.Cos(j / 5.0) + 50 * rng.NextDouble());
            if (x * x + y * y + z * z <= 1) mask[i, j, k] = 1;
        }
        return (image, mask);
    }

    private RadiomicsSettings Settings(params FeatureFamily[] families) => new()
    {
        Discretisation = new DiscretisationSettings { BinCount = Bins },
        IvhDiscretisation = new DiscretisationSettings { BinCount = 1000 },
        Families = families.Length == 0 ? Enum.GetValues<FeatureFamily>() : families,
    };

    [Benchmark(Baseline = true)]
    public int AllFamilies() => RadiomicsExtractor.Extract(_image, _mask, Settings()).Count;

    [Benchmark]
    public int Morphology() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.Morphology)).Count;

    [Benchmark]
    public int LocalIntensity() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.LocalIntensity)).Count;

    [Benchmark]
    public int FirstOrder() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.IntensityStatistics,
        FeatureFamily.IntensityHistogram, FeatureFamily.IntensityVolumeHistogram)).Count;

    [Benchmark]
    public int Glcm() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.Glcm)).Count;

    [Benchmark]
    public int Glrlm() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.Glrlm)).Count;

    [Benchmark]
    public int ZoneFamilies() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.Glszm, FeatureFamily.Gldzm)).Count;

    [Benchmark]
    public int NeighbourhoodFamilies() => RadiomicsExtractor.Extract(_image, _mask, Settings(FeatureFamily.Ngtdm, FeatureFamily.Ngldm)).Count;
}
