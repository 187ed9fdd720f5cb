using System.Text.Json;
using Serimetry.Engine.Core;
using Serimetry.Engine.Phantoms;
using Xunit;

namespace Serimetry.Tests.Phantoms;

public sealed class PhantomGeneratorTests
{
    // Small grids keep the tests fast; the geometry logic is the same as the default 256x256x24 grid.
    internal static PhantomSpec Small(int seed = 7, int visits = 3) => new()
    {
        Seed = seed,
        Visits = visits,
        T2Grid = new PhantomGrid(96, 96, 22, 0.8, 0.8, 3.0),
        DwiGrid = new PhantomGrid(40, 40, 22, 2.0, 2.0, 3.0),
    };

    private static readonly Lazy<PhantomSubject> Shared = new(() => PhantomGenerator.Generate(Small()));

    [Fact]
    public void TrueTransformsAreRigid()
    {
        foreach (var v in Shared.Value.Visits)
        {
            var r = v.Truth.BaselineToVisit.Linear;
            Assert.True(r.IsOrthonormal(1e-12));
            Assert.Equal(1.0, r.Determinant, 12);
        }
        Assert.Equal(AffineTransform.Identity, Shared.Value.Visits[0].Truth.BaselineToVisit);
        var spec = Small();
        foreach (var v in Shared.Value.Visits.Skip(1))
        {
            // Rotation angle from the trace: cos θ = (tr R − 1)/2; within the spec's maximum.
            var r = v.Truth.BaselineToVisit.Linear;
            double angle = Math.Acos(Math.Clamp((r.M00 + r.M11 + r.M22 - 1) / 2, -1, 1)) * 180 / Math.PI;
            Assert.InRange(angle, 0, spec.MaxRotateDeg + 1e-9);
            Assert.InRange(v.Truth.GlandCentreMm.Norm, 0, spec.MaxShiftMm + 1e-9);
        }
    }

    [Fact]
    public void GlandMaskCentroidFollowsTheTrueTransform()
    {
        // The anatomy is evaluated at T⁻¹(voxel centre), so the gland mask centroid must sit at T(gland centre).
        foreach (var v in Shared.Value.Visits)
        {
            var centroid = Centroid(v.GlandMask);
            Assert.True((centroid - v.Truth.GlandCentreMm).Norm < 0.5, $"visit {v.Index}: {centroid} vs {v.Truth.GlandCentreMm}");
            var lesion = Centroid(v.LesionMask);
            Assert.True((lesion - v.Truth.LesionCentreMm).Norm < 1.0, $"visit {v.Index}: lesion {lesion} vs {v.Truth.LesionCentreMm}");
        }
    }

    [Fact]
    public void VoxelisedVolumesAgreeWithAnalyticWithinPartialVolumeError()
    {
        // Documented bound (docs/qa.md): centre sampling on 0.8x0.8x3 mm voxels, gland within 2 %, lesion
        // (radius ≥ 5 mm) within 6 %. Analytic volume of an ellipsoid 4/3·π·abc (common practice).
        foreach (var v in Shared.Value.Visits)
        {
            var t = v.Truth;
            Assert.Equal(4.0 / 3 * Math.PI * 24 * 17 * 19 / 1000, t.GlandVolumeMl, 9);
            Assert.InRange(t.GlandVolumeVoxelisedMl / t.GlandVolumeMl, 0.98, 1.02);
            Assert.InRange(t.LesionVolumeVoxelisedMl / t.LesionVolumeMl, 0.94, 1.06);
        }
    }

    [Fact]
    public void LesionGrowthFactorIsRealised()
    {
        var visits = Shared.Value.Visits;
        for (int k = 1; k < visits.Count; k++)
        {
            Assert.Equal(1.3, visits[k].Truth.LesionVolumeMl / visits[k - 1].Truth.LesionVolumeMl, 12);
            Assert.InRange(visits[k].Truth.LesionVolumeVoxelisedMl / visits[k - 1].Truth.LesionVolumeVoxelisedMl, 1.3 * 0.9, 1.3 * 1.1);
        }
    }

    [Fact]
    public void LesionIsDarkOnT2AndAdcInsidePeripheralZone()
    {
        var v = Shared.Value.Visits[0];
        double lesionT2 = MeanWhere(v.T2w, v.LesionMask, 1), pzT2 = MeanInZoneOutsideLesion(v, 1), tzT2 = MeanInZoneOutsideLesion(v, 2);
        Assert.True(lesionT2 < tzT2 && tzT2 < pzT2, $"T2 lesion {lesionT2:F0} TZ {tzT2:F0} PZ {pzT2:F0}");
        Assert.All(Enumerable.Range(0, v.LesionMask.Voxels.Length).Where(i => v.LesionMask.Voxels[i] == 1),
            i => Assert.Equal(1, v.ZoneMask.Voxels[i]));
        // Scanner-style ADC: mean over ADC-grid voxels whose centres lie well inside the lesion (no partial volume)
        // is near the true 800 (per-voxel noise at DWI SNR 30 is about ±20 %).
        double sum = 0; int n = 0;
        var g = v.Adc.Geometry;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    if ((g.IndexToPhysical(i, j, k) - v.Truth.LesionCentreMm).Norm < v.Truth.LesionRadiusMm - 1.5) { sum += v.Adc[i, j, k]; n++; }
        Assert.True(n >= 5, $"{n} voxels");
        Assert.InRange(sum / n, 800 * 0.9, 800 * 1.1);
    }

    [Fact]
    public void SameSeedGivesIdenticalVoxels()
    {
        var spec = Small(seed: 11, visits: 2) with { T2Grid = new PhantomGrid(40, 40, 8, 1.5, 1.5, 3), DwiGrid = new PhantomGrid(20, 20, 8, 3, 3, 3) };
        var a = PhantomGenerator.Generate(spec, 1);
        var b = PhantomGenerator.Generate(spec, 4);
        Assert.Equal(a.Visits[1].T2w.Voxels, b.Visits[1].T2w.Voxels);
        Assert.Equal(a.Visits[1].Adc.Voxels, b.Visits[1].Adc.Voxels);
    }

    [Fact]
    public void SpecRoundTripsAndRejectsBadValues()
    {
        var spec = Small();
        var back = PhantomSpec.Parse(spec.ToJson(), "s.json");
        Assert.Equal(spec.ToJson(), back.ToJson());
        Assert.Throws<InputFormatException>(() => PhantomSpec.Parse("{\"sede\": 3}", "s.json"));
        Assert.Throws<InvalidParameterException>(() => PhantomSpec.Parse("{\"visits\": 0}", "s.json"));
        Assert.Throws<InvalidParameterException>(() => PhantomGenerator.Generate(spec with { LesionRadiusMm = 12 }));
    }

    [Fact]
    public void TruthJsonHasTheDocumentedFields()
    {
        using var ms = new MemoryStream();
        PhantomTruthWriter.Write(ms, Shared.Value);
        using var doc = JsonDocument.Parse(ms.ToArray());
        var visits = doc.RootElement.GetProperty("visits");
        Assert.Equal(3, visits.GetArrayLength());
        var v1 = visits[1];
        var m = v1.GetProperty("transform").GetProperty("matrix").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        var t = AffineTransform.FromMatrix4x4(m);
        Assert.Equal(Shared.Value.Visits[1].Truth.BaselineToVisit.TranslationMm, t.TranslationMm);
        Assert.Equal(800, v1.GetProperty("lesionAdc").GetDouble());
        Assert.Equal(1600, v1.GetProperty("tissueAdc").GetProperty("peripheralZone").GetDouble());
        Assert.Equal(5.8, v1.GetProperty("psa").GetDouble());
        Assert.Equal("2023-09-14", v1.GetProperty("date").GetString());
        Assert.True(v1.GetProperty("lesionVolumeMl").GetDouble() > 0 && v1.GetProperty("glandVolumeVoxelisedMl").GetDouble() > 0);
    }

    private static Vec3 Centroid(Volume<byte> mask)
    {
        var sum = Vec3.Zero; long n = 0;
        for (int k = 0; k < mask.Size.Z; k++)
            for (int j = 0; j < mask.Size.Y; j++)
                for (int i = 0; i < mask.Size.X; i++)
                    if (mask[i, j, k] != 0) { sum += mask.Geometry.IndexToPhysical(i, j, k); n++; }
        return sum / n;
    }

    private static double MeanWhere(Volume<float> img, Volume<byte> mask, byte label)
    {
        double s = 0; long n = 0;
        for (int v = 0; v < img.Voxels.Length; v++) if (mask.Voxels[v] == label) { s += img.Voxels[v]; n++; }
        return s / n;
    }

    private static double MeanInZoneOutsideLesion(PhantomVisit v, byte zone)
    {
        double s = 0; long n = 0;
        for (int i = 0; i < v.T2w.Voxels.Length; i++)
            if (v.ZoneMask.Voxels[i] == zone && v.LesionMask.Voxels[i] == 0) { s += v.T2w.Voxels[i]; n++; }
        return s / n;
    }
}

public sealed class PhantomDeformationTests
{
    [Fact]
    public void MildDeformationMovesAnatomyButPreservesVolume()
    {
        var rigid = PhantomGeneratorTests.Small(visits: 2);
        var deformed = PhantomGenerator.Generate(rigid with { DeformationMm = 2.5, DeformationWavelengthMm = 60 });
        var plain = PhantomGenerator.Generate(rigid);
        var t = deformed.Visits[1].Truth;
        Assert.NotNull(t.Deformation);
        Assert.Null(deformed.Visits[0].Truth.Deformation);
        Assert.Equal(plain.Visits[1].Truth.BaselineToVisit, t.BaselineToVisit);
        // The deformation changes which voxels are gland…
        int differing = plain.Visits[1].GlandMask.Voxels.Zip(deformed.Visits[1].GlandMask.Voxels).Count(p => p.First != p.Second);
        Assert.True(differing > 100, $"{differing} voxels differ");
        // …but is divergence-free, so volumes stay within the partial-volume tolerance of the analytic value.
        Assert.InRange(t.GlandVolumeVoxelisedMl / t.GlandVolumeMl, 0.98, 1.02);
        Assert.InRange(t.LesionVolumeVoxelisedMl / t.LesionVolumeMl, 0.94, 1.06);
        // The true lesion centre (deformation inverted) lies in the deformed lesion mask.
        var lesion = deformed.Visits[1].LesionMask;
        var c = lesion.Geometry.PhysicalToIndex(t.LesionCentreMm);
        Assert.Equal(1, lesion[(int)Math.Round(c.X), (int)Math.Round(c.Y), (int)Math.Round(c.Z)]);
    }

    [Fact]
    public void DeformedMotionInvertsExactly()
    {
        var d = new PhantomDeformation(2.5, 60, new Serimetry.Engine.Core.Vec3(0.3, 1.1, 2.0));
        var rigid = new Serimetry.Engine.Core.AffineTransform(PhantomGenerator.Rotation(new Serimetry.Engine.Core.Vec3(0, 0, 1), 0.05),
            new Serimetry.Engine.Core.Vec3(1, -2, 3));
        var motion = new PhantomMotion(rigid, d, Serimetry.Engine.Core.Vec3.Zero);
        var rng = new Random(4);
        for (int i = 0; i < 50; i++)
        {
            var p = new Serimetry.Engine.Core.Vec3(rng.NextDouble() * 60 - 30, rng.NextDouble() * 60 - 30, rng.NextDouble() * 60 - 30);
            Assert.True((motion.VisitToBaseline(motion.BaselineToVisit(p)) - p).Norm < 1e-9);
        }
    }

    [Fact]
    public void StrongDeformationIsRefused()
    {
        Assert.Throws<Serimetry.Engine.Core.InvalidParameterException>(() =>
            PhantomGenerator.Generate(PhantomGeneratorTests.Small() with { DeformationMm = 5, DeformationWavelengthMm = 20 }));
    }
}
