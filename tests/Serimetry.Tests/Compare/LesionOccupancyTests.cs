using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Phantoms;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Tests.Compare;

/// <summary>The partial-volume occupancy of a re-fitted lesion against the phantom's analytic lesion volume.</summary>
public sealed class LesionOccupancyTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(3.7, 1)] // 0.21 mL: the smallest lesion size the volume claim covers
    [InlineData(4.5, 2)]
    [InlineData(6.0, 3)]
    public void OccupancyVolumeMatchesTheAnalyticVolumeOnThickSlices(double radiusMm, int seed)
    {
        // Src: the phantom generator's analytic lesion (sphere, 4/3·π·r³) rendered with partial volume at its edge on
        // 0.6 × 0.6 × 3 mm voxels at T2w SNR 40. Re-fitted from the true outline, the occupancy volume must be within
        // ±5 % of the analytic volume, where a binary outline on 3 mm slices can miss the thin caps.
        var spec = new PhantomSpec() with
        {
            Seed = seed, Visits = 1, LesionRadiusMm = radiusMm, MaxRotateDeg = 0, MaxShiftMm = 0,
            T2Grid = new PhantomGrid(110, 96, 18, 0.6, 0.6, 3.0), DwiGrid = new PhantomGrid(44, 38, 18, 1.5, 1.5, 3.0),
        };
        var visit = PhantomGenerator.Generate(spec).Visits[0];
        var gland = MaskOps.Binarize(visit.GlandMask);
        var lesion = MaskOps.Binarize(visit.LesionMask);
        var adcOnT2 = Engine.Imaging.Resampler.Resample(visit.Adc, visit.T2w.Geometry, null, Engine.Imaging.Interpolation.Linear, float.NaN);
        var settings = new LesionRefitSettings();
        var model = LesionRefit.Learn(visit.T2w, adcOnT2, lesion, gland, settings);
        var refit = LesionRefit.Refit(visit.T2w, adcOnT2, lesion, gland, model, settings);
        Assert.True(refit.Refitted, refit.Note);
        Assert.True(refit.Occupancy is not null, refit.OccupancyNote);
        double voxelMl = visit.T2w.Geometry.VoxelVolumeMm3 / 1000;
        double occupancyMl = refit.Occupancy!.Voxels.Sum(f => (double)f) * voxelMl;
        double binaryMl = MaskOps.Count(refit.Mask) * voxelMl;
        double truth = visit.Truth.LesionVolumeMl;
        output.WriteLine($"r {radiusMm} mm: truth {truth:F3} mL, occupancy {occupancyMl:F3}, binary re-fit {binaryMl:F3}");
        Assert.InRange(occupancyMl / truth, 0.95, 1.05);
        Assert.All(refit.Occupancy.Voxels, f => Assert.InRange(f, 0f, 1f));
    }

    [Fact]
    public void FlatImageGivesNoOccupancy()
    {
        // Analytic: with no T2w contrast between the outline and its surroundings no fraction can be estimated, so the
        // binary outline must stand (null occupancy with a reason) rather than an invented partial volume.
        var grid = Geometry.Axial(new Size3(40, 40, 10), new Vec3(0.6, 0.6, 3), Vec3.Zero);
        var t2 = new Volume<float>(grid);
        var rng = new Random(5);
        for (int n = 0; n < t2.Voxels.Length; n++) t2.Voxels[n] = 500 + (float)(10 * (rng.NextDouble() - 0.5));
        var lesion = new Volume<byte>(grid);
        for (int k = 3; k < 7; k++)
            for (int j = 12; j < 28; j++)
                for (int i = 12; i < 28; i++) lesion[i, j, k] = 1;
        var region = new Volume<byte>(grid);
        region.Voxels.AsSpan().Fill(1);
        Assert.Null(LesionOccupancy.Estimate(t2, lesion, region, out var reason));
        Assert.NotNull(reason);
    }
}
