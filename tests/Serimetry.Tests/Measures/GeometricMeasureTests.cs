using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Measures.BuiltIn;
using Xunit;

namespace Serimetry.Tests.Measures;

/// <summary>Volumes, extents, ellipsoid volumes and diameters of voxelised analytic shapes (truth: geometry).</summary>
public class GeometricMeasureTests
{
    private static readonly Vec3 Centre = new(3.3, -11.7, 20.2);

    public static TheoryData<string, double, double, double, double, double, double> Grids => new()
    {
        // name, spacing x, y, z, rotation axis (index into Axes), degrees, volume tolerance
        { "isotropic", 0.5, 0.5, 0.5, 0, 0, 0.01 },
        { "anisotropic", 0.5, 0.6, 3.0, 0, 0, 0.04 },
        { "oblique", 0.6, 0.6, 1.5, 1, 27, 0.03 },
    };

    private static readonly Vec3[] Axes = [new(0, 0, 1), new(1, 0.4, 0.2)];

    private static Geometry Grid(double sx, double sy, double sz, double axis, double degrees)
    {
        var dir = degrees == 0 ? Mat3.Identity : SyntheticMasks.Rotation(Axes[(int)axis], degrees);
        var spacing = new Vec3(sx, sy, sz);
        var size = new Size3((int)Math.Ceiling(48 / sx), (int)Math.Ceiling(48 / sy), (int)Math.Ceiling(48 / sz));
        return SyntheticMasks.Centred(size, spacing, dir, Centre + new Vec3(0.13, 0.07, 0.21));
    }

    private static VisitContext Context(Volume<byte> lesion, Volume<byte>? gland = null) =>
        new(0, new DateOnly(2024, 1, 1), new Volume<float>(lesion.Geometry))
        {
            LesionMask = lesion,
            GlandMask = gland,
        };

    [Theory]
    [MemberData(nameof(Grids))]
    public void SphereVolumeMatchesFourThirdsPiRCubed(string name, double sx, double sy, double sz, double axis, double deg, double tol)
    {
        // Src: analytic sphere volume 4/3·π·r³; tolerance = voxel-centre discretisation error of the grid.
        const double r = 10;
        var g = Grid(sx, sy, sz, axis, deg);
        var lesion = SyntheticMasks.Ellipsoid(g, Centre, new Vec3(r, r, r));
        var v = new MaskVolumeMeasure(MaskKind.Lesion).Measure(Context(lesion));
        Assert.Equal(MeasureStatus.Ok, v.Status);
        double truth = 4.0 / 3 * Math.PI * r * r * r / 1000;
        Assert.True(Math.Abs(v.Value!.Value - truth) / truth < tol, $"{name}: {v.Value} mL vs {truth} mL");
    }

    [Theory]
    [MemberData(nameof(Grids))]
    public void EllipsoidExtentsAndPiRadsVolumeMatchTheSemiAxes(string name, double sx, double sy, double sz, double axis, double deg, double tol)
    {
        // Src: an ellipsoid with semi-axes a, b, c has extents 2a, 2b, 2c along its axes and volume
        // 4/3·π·abc = π/6·(2a)(2b)(2c), the PI-RADS formula (facts.md §4). Extents of the voxelised shape
        // differ from the analytic ones by less than the projected width of one voxel box.
        var semi = new Vec3(12, 8, 6);
        var g = Grid(sx, sy, sz, axis, deg);
        var ctx = Context(SyntheticMasks.Ellipsoid(g, Centre, semi));
        var m = g.IndexToPhysicalMatrix;
        var width = new Vec3(Math.Abs(m.M00) + Math.Abs(m.M01) + Math.Abs(m.M02),
            Math.Abs(m.M10) + Math.Abs(m.M11) + Math.Abs(m.M12), Math.Abs(m.M20) + Math.Abs(m.M21) + Math.Abs(m.M22));
        double lr = new ExtentMeasure(MaskKind.Lesion, PatientAxis.LeftRight).Measure(ctx).Value!.Value;
        double ap = new ExtentMeasure(MaskKind.Lesion, PatientAxis.AnteroPosterior).Measure(ctx).Value!.Value;
        double cc = new ExtentMeasure(MaskKind.Lesion, PatientAxis.CranioCaudal).Measure(ctx).Value!.Value;
        Assert.InRange(lr, 24 - width.X, 24 + width.X);
        Assert.InRange(ap, 16 - width.Y, 16 + width.Y);
        Assert.InRange(cc, 12 - width.Z, 12 + width.Z);
        double ellipsoid = new EllipsoidVolumeMeasure(MaskKind.Lesion).Measure(ctx).Value!.Value;
        Assert.Equal(Math.PI / 6 * lr * ap * cc / 1000, ellipsoid, 12);
        double truth = 4.0 / 3 * Math.PI * 12 * 8 * 6 / 1000;
        double count = new MaskVolumeMeasure(MaskKind.Lesion).Measure(ctx).Value!.Value;
        Assert.True(Math.Abs(count - truth) / truth < tol + 0.01, $"{name}: voxel volume {count} vs {truth}");
    }

    [Theory]
    [MemberData(nameof(Grids))]
    public void LargestDiameterIsTheLongAxis(string name, double sx, double sy, double sz, double axis, double deg, double tol)
    {
        // Src: the longest chord of an ellipsoid is its major axis 2a. Boundary voxel centres lie inside the
        // surface by at most one voxel diagonal, so the measured value is in [2a − 2·diag, 2a].
        _ = tol;
        var g = Grid(sx, sy, sz, axis, deg);
        var ctx = Context(SyntheticMasks.Ellipsoid(g, Centre, new Vec3(12, 8, 6)));
        var v = new LesionDiameterMeasure().Measure(ctx);
        double diag = Math.Sqrt(sx * sx + sy * sy + sz * sz);
        Assert.True(v.Value <= 24 + 1e-9 && v.Value >= 24 - 2 * diag, $"{name}: {v.Value} mm");
    }

    [Fact]
    public void MaxPairDistanceIsExactOnAFewPoints()
    {
        // Src: hand-computed: the farthest pair of these points is (0,0,0)-(3,4,12), distance 13.
        var pts = new List<Vec3> { new(0, 0, 0), new(3, 4, 12), new(1, 1, 1), new(2, 0, 5) };
        Assert.Equal(13, LesionDiameterMeasure.MaxPairDistance(pts), 12);
    }

    [Fact]
    public void VolumeIsUnchangedByFlippingAnIndexAxis()
    {
        // Property (common practice, STYLE.md): flipping the direction of an index axis and mirroring the
        // voxels describes the same physical object, so the volume and extents must not change.
        var g = Grid(0.7, 0.7, 2, 0, 0);
        var mask = SyntheticMasks.Ellipsoid(g, Centre, new Vec3(9, 7, 5));
        var flippedDir = Mat3.FromColumns(-g.Direction.Column(0), g.Direction.Column(1), g.Direction.Column(2));
        var fg = g.With(originMm: g.IndexToPhysical(g.Size.X - 1, 0, 0), direction: flippedDir);
        var flipped = SyntheticMasks.Ellipsoid(fg, Centre, new Vec3(9, 7, 5));
        var a = Context(mask);
        var b = Context(flipped);
        Assert.Equal(new MaskVolumeMeasure(MaskKind.Lesion).Measure(a).Value, new MaskVolumeMeasure(MaskKind.Lesion).Measure(b).Value);
        Assert.Equal(new ExtentMeasure(MaskKind.Lesion, PatientAxis.LeftRight).Measure(a).Value!.Value,
            new ExtentMeasure(MaskKind.Lesion, PatientAxis.LeftRight).Measure(b).Value!.Value, 9);
    }

    [Fact]
    public void IbsiDigitalPhantomVoxelCountVolume()
    {
        // Src: IBSI chapter 1 reference values, digital phantom, "Volume (voxel counting)" YEKZ = 592 mm³.
        var phantom = IbsiPhantom.Load();
        var v = new MaskVolumeMeasure(MaskKind.Lesion).Measure(phantom.Context);
        Assert.Equal(0.592, v.Value!.Value, 9);
        Assert.Equal("YEKZ", new MaskVolumeMeasure(MaskKind.Lesion).IbsiCode);
    }

    [Fact]
    public void MaskOnAnotherGridIsCarriedByNearestNeighbour()
    {
        // Src: analytic: a sphere mask on a fine grid transferred to a coarse grid keeps its volume within
        // the coarse grid's discretisation error.
        var fine = Grid(0.5, 0.5, 0.5, 0, 0);
        var coarse = Grid(1.5, 1.5, 3, 1, 15);
        var mask = SyntheticMasks.Ellipsoid(fine, Centre, new Vec3(10, 10, 10));
        var onCoarse = MaskGrid.OnGrid(mask, coarse);
        double v = MaskGrid.Count(onCoarse.Voxels) * coarse.VoxelVolumeMm3 / 1000;
        double truth = 4.0 / 3 * Math.PI * 1000 / 1000;
        Assert.True(Math.Abs(v - truth) / truth < 0.06, $"{v} vs {truth}");
        Assert.Same(mask, MaskGrid.OnGrid(mask, fine));
    }
}
