using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Preparation;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Radiomics;

/// <summary>Processing-chain steps against the IBSI formulas (Src: IBSI reference manual, arXiv:1612.07003, sections 2.4–2.7).</summary>
public sealed class RadiomicsChainTests
{
    [Fact]
    public void Fixed_bin_number_follows_the_IBSI_formula()
    {
        // Src: IBSI 2.7.1: X_d = floor(N_g (X − X_min)/(X_max − X_min)) + 1, with X_max in bin N_g.
        double[] x = [0, 10, 24.9, 25, 50, 99, 100];
        var d = Discretiser.Discretise(x, [1, 1, 1, 1, 1, 1, 1], new DiscretisationSettings { BinCount = 4 }, null, "t");
        Assert.Equal([1, 1, 1, 2, 3, 4, 4], d.Levels);
        Assert.Equal(4, d.BinCount);
    }

    [Fact]
    public void Fixed_bin_size_follows_the_IBSI_formula()
    {
        // Src: IBSI 2.7.2: X_d = floor((X − X_min)/w_b) + 1 with X_min the re-segmentation lower bound.
        double[] x = [-500, -476, -475, 0, 30];
        var s = new DiscretisationSettings { Method = DiscretisationMethod.FixedBinSize, BinWidth = 25 };
        var d = Discretiser.Discretise(x, [1, 1, 1, 1, 0], s, -500, "t");
        Assert.Equal([1, 1, 2, 21, 0], d.Levels);
        Assert.Equal(-500 + 0.5 * 25, d.ValueOf(1));     // bin centre for the IVH
    }

    [Fact]
    public void Resampling_aligns_grid_centres_so_a_linear_ramp_keeps_its_mean()
    {
        // Src: IBSI reference manual 2.4 "align grid centres" (n_b = ceil(n_a s_a / s_b), centres coincide) and
        // common practice (trilinear interpolation is exact for a linear function; edge clamping is symmetric about the
        // centre for a ramp): the ROI mean stays the ramp's value at the grid centre.
        var g = Geometry.Axial(new Size3(6, 5, 4), new Vec3(2, 2, 3), new Vec3(10, -4, 7));
        var image = new Volume<float>(g);
        var mask = new Volume<byte>(g);
        for (int k = 0; k < 4; k++) for (int j = 0; j < 5; j++) for (int i = 0; i < 6; i++)
        {
            var p = g.IndexToPhysical(i, j, k);
            image[i, j, k] = (float)(3 * p.X + 2 * p.Y - p.Z);
            mask[i, j, k] = 1;
        }
        var c = g.CenterMm;
        var settings = new RadiomicsSettings
        {
            Families = [FeatureFamily.IntensityStatistics],
            Resampling = new ResamplingSettings { SpacingMm = [1.0, 1.0, 1.5] },
        };
        var f = RadiomicsExtractor.Extract(image, mask, settings);
        Assert.Equal(3 * c.X + 2 * c.Y - c.Z, f.Single(v => v.IbsiCode == "Q4LE").Value, 4);
        Assert.Equal(6.0 * 5 * 4 * 12, RadiomicsExtractor.Extract(image, mask, settings with { Families = [FeatureFamily.Morphology] })
            .Single(v => v.IbsiCode == "YEKZ").Value, 9);   // 12 × 10 × 8 voxels of 1.5 mm³: the original 1440 mm³
    }

    [Fact]
    public void Resampling_to_the_same_spacing_changes_nothing()
    {
        var (image, mask) = RadiomicsTestData.Phantom();
        var native = RadiomicsExtractor.Extract(image, mask, RadiomicsTestData.PhantomSettings);
        var same = RadiomicsExtractor.Extract(image, mask, RadiomicsTestData.PhantomSettings with
        {
            Resampling = new ResamplingSettings { SpacingMm = [2.0, 2.0, 2.0] },
        });
        Assert.Equal(native.Count, same.Count);
        for (int n = 0; n < native.Count; n++)
            Assert.True(native[n].Value.Equals(same[n].Value) || Math.Abs(native[n].Value - same[n].Value) < 1e-9, native[n].Feature);
    }

    [Fact]
    public void Resampled_and_rebinarised_ball_keeps_its_volume()
    {
        // Src: analytic ball volume 4/3·πR³; the mask is interpolated linearly and re-binarised at 0.5 (IBSI 2.4).
        var (image, mask) = RadiomicsTestData.Sphere(8, 1.0);
        double truth = 4.0 / 3.0 * Math.PI * 512;
        foreach (double spacing in new[] { 0.8, 1.6, 2.0 })
        {
            var f = RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings
            {
                Families = [FeatureFamily.Morphology],
                Resampling = new ResamplingSettings { SpacingMm = [spacing, spacing, spacing] },
            });
            double voxelVolume = f.Single(v => v.IbsiCode == "YEKZ").Value;
            Assert.True(Math.Abs(voxelVolume / truth - 1) < 0.06, $"{spacing} mm: {voxelVolume:F0} mm³ vs {truth:F0} mm³");
        }
    }

    [Fact]
    public void Outlier_filter_removes_values_beyond_three_standard_deviations()
    {
        var g = Geometry.Axial(new Size3(20, 1, 1), new Vec3(1, 1, 1), new Vec3(0, 0, 0));
        var image = new Volume<float>(g);
        var mask = new Volume<byte>(g);
        for (int i = 0; i < 20; i++) { image[i, 0, 0] = i == 7 ? 1000 : 10 + (i % 2); mask[i, 0, 0] = 1; }
        var f = RadiomicsExtractor.Extract(image, mask, new RadiomicsSettings
        {
            Families = [FeatureFamily.IntensityStatistics],
            Resegmentation = new ResegmentationSettings { OutlierFilter3Sd = true },
        });
        Assert.Equal(11.0, f.Single(v => v.IbsiCode == "84IY").Value);  // the 1000 outlier is gone
    }

    [Fact]
    public void Shipped_phantom_settings_parse_and_round_trip()
    {
        var text = File.ReadAllText(Path.Combine(SharedReference.RepoRoot, "phantoms", "ibsi-digital-phantom.settings.json"));
        var s = RadiomicsSettingsJson.Parse(text, "phantom settings");
        Assert.Null(s.Resampling);
        Assert.Equal(DiscretisationMethod.FixedBinSize, s.Discretisation.Method);
        var again = RadiomicsSettingsJson.Parse(RadiomicsSettingsJson.Serialize(s), "round trip");
        Assert.Equal(s.Discretisation, again.Discretisation);
        Assert.Equal(s.Texture.Dimensions, again.Texture.Dimensions);
    }

    [Fact]
    public void Csv_is_tidy_with_empty_cells_for_NaN()
    {
        var csv = FeatureCsvWriter.ToCsv([new FeatureValue("glcm", "Joint maximum", "GYBY", "IAZD", 0.5),
            new FeatureValue("glcm", "Correlation, odd", "NI2N", "IAZD", double.NaN)]);
        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("family,feature,ibsiCode,aggregationCode,value", lines[0]);
        Assert.Equal("glcm,Joint maximum,GYBY,IAZD,0.5", lines[1]);
        Assert.Equal("glcm,\"Correlation, odd\",NI2N,IAZD,", lines[2]);
    }

    [Fact]
    public void Aggregation_code_is_set_for_texture_features_only()
    {
        // Src: IBSI reference manual 3.1.1: aggregation methods apply to the texture matrices; the other families
        // describe the whole 3D ROI (the features.csv contract: aggregationCode empty for them).
        string[] texture = [FamilyNames.Glcm, FamilyNames.Glrlm, FamilyNames.Glszm, FamilyNames.Gldzm, FamilyNames.Ngtdm, FamilyNames.Ngldm];
        var (image, mask) = RadiomicsTestData.Phantom();
        var features = RadiomicsExtractor.Extract(image, mask, RadiomicsTestData.PhantomSettings);
        var lines = FeatureCsvWriter.ToCsv(features).Split('\n', StringSplitOptions.RemoveEmptyEntries).Skip(1).Select(l => l.Split(',')).ToList();
        Assert.Equal(features.Count, lines.Count);
        for (int n = 0; n < features.Count; n++)
        {
            bool isTexture = texture.Contains(features[n].Family);
            Assert.True(isTexture == (lines[n][^2].Length == 4), $"{features[n].Family}/{features[n].Feature}: aggregationCode '{lines[n][^2]}'");
        }
        Assert.Contains(features, f => f.Family == FamilyNames.Morphology);
    }
}
