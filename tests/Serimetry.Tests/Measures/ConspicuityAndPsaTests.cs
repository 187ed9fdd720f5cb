using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Measures.BuiltIn;
using Xunit;

namespace Serimetry.Tests.Measures;

/// <summary>Conspicuity (ratio and CNR), the peri-lesional shell and PSA density on shapes with known truth.</summary>
public class ConspicuityAndPsaTests
{
    private static readonly Vec3 C = new(-4, 6, 10);

    private static (Geometry G, Volume<byte> Lesion, Volume<byte> Gland) Scene(Mat3 dir)
    {
        var g = SyntheticMasks.Centred(new Size3(90, 90, 40), new Vec3(0.6, 0.6, 1.2), dir, C);
        return (g, SyntheticMasks.Ellipsoid(g, C, new Vec3(6, 6, 6)), SyntheticMasks.Ellipsoid(g, C, new Vec3(24, 22, 20)));
    }

    [Fact]
    public void ShellIsTheSphericalShellAroundTheLesion()
    {
        // Src: analytic geometry. Lesion = sphere r = 6 mm, d = 5 mm. Any point within r − diag/2 of the centre
        // has a lesion voxel centre within diag/2 (diag = voxel diagonal), so every gland voxel with
        // r < |x − c| ≤ r + d − diag must be in the shell, and none with |x − c| > r + d may be. The shell
        // volume therefore lies between the analytic shells with outer radii r + d − diag/2 and r + d.
        var (g, lesion, gland) = Scene(SyntheticMasks.Rotation(new Vec3(0.3, 1, 0), 20));
        var shell = PeriLesionalShell.Build(lesion, gland, 5);
        double diag = g.SpacingMm.Norm;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    double rho = (g.IndexToPhysical(i, j, k) - C).Norm;
                    int o = lesion.LinearIndex(i, j, k);
                    if (rho > 6 && rho <= 11 - diag) Assert.Equal(1, shell[o]);
                    if (rho > 11 || lesion.Voxels[o] != 0) Assert.Equal(0, shell[o]);
                }
        double v = MaskGrid.Count(shell) * g.VoxelVolumeMm3;
        double Shell(double outer) => 4.0 / 3 * Math.PI * (Math.Pow(outer, 3) - Math.Pow(6, 3));
        Assert.InRange(v, Shell(11 - diag / 2) * 0.98, Shell(11) * 1.02);
    }

    [Fact]
    public void RatioAndCnrOnTwoLevelTissue()
    {
        // Src: analytic. Lesion 50, surrounding gland alternating 90/110 by slice: shell mean ≈ 100 and SD ≈ 10,
        // so ratio = 0.5 and CNR = (50 − 100)/10 = −5 (within the imbalance of slice counts).
        var (g, lesion, gland) = Scene(Mat3.Identity);
        var t2 = new Volume<float>(g);
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                    t2[i, j, k] = lesion[i, j, k] != 0 ? 50 : (k % 2 == 0 ? 90 : 110);
        var ctx = new VisitContext(0, new DateOnly(2024, 3, 1), t2) { LesionMask = lesion, GlandMask = gland };
        var ratio = new ConspicuityMeasure(ConspicuityImage.T2w, false).Measure(ctx);
        var cnr = new ConspicuityMeasure(ConspicuityImage.T2w, true).Measure(ctx);
        Assert.Equal("lesion.conspicuity.t2w", ratio.MeasureId);
        Assert.Equal("lesion.conspicuity.t2w.cnr", cnr.MeasureId);
        Assert.Equal(0.5, ratio.Value!.Value, 0.01);
        Assert.Equal(-5, cnr.Value!.Value, 0.15);
    }

    [Fact]
    public void ConstantShellGivesRatioButNoCnr()
    {
        // Src: analytic: with a constant shell the SD is 0 and the CNR is undefined (reported, not NaN).
        var (g, lesion, gland) = Scene(Mat3.Identity);
        var adc = SyntheticMasks.Image(g, p => (p - C).Norm <= 6 ? 700f : 1400f);
        var ctx = new VisitContext(0, new DateOnly(2024, 3, 1), new Volume<float>(g)) { Adc = adc, LesionMask = lesion, GlandMask = gland };
        Assert.Equal(0.5, new ConspicuityMeasure(ConspicuityImage.Adc, false).Measure(ctx).Value!.Value, 12);
        var cnr = new ConspicuityMeasure(ConspicuityImage.Adc, true).Measure(ctx);
        Assert.Equal(MeasureStatus.NotApplicable, cnr.Status);
        Assert.Contains("SD 0", cnr.Reason);
    }

    [Fact]
    public void PsaDensityIsPsaOverGlandVolume()
    {
        // Src: PSAD = PSA / prostate volume (facts.md §6, Hardman et al. 2011). Gland sphere r = 20 mm.
        var g = SyntheticMasks.Centred(new Size3(100, 100, 50), new Vec3(0.5, 0.5, 1), Mat3.Identity, C);
        var gland = SyntheticMasks.Ellipsoid(g, C, new Vec3(20, 20, 20));
        var ctx = new VisitContext(0, new DateOnly(2024, 3, 1), new Volume<float>(g)) { GlandMask = gland, PsaNgPerMl = 6.0 };
        double glandMl = new MaskVolumeMeasure(MaskKind.Gland).Measure(ctx).Value!.Value;
        Assert.Equal(6.0 / glandMl, new PsaDensityMeasure().Measure(ctx).Value!.Value, 12);
        Assert.Equal(6.0 / (4.0 / 3 * Math.PI * 8), new PsaDensityMeasure().Measure(ctx).Value!.Value, 0.003);
        var given = new VisitContext(0, new DateOnly(2024, 3, 1), new Volume<float>(g)) { GlandVolumeMlOverride = 40, PsaNgPerMl = 6.0 };
        Assert.Equal(0.15, new PsaDensityMeasure().Measure(given).Value!.Value, 12);
    }
}
