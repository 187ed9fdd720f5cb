using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Xunit;

namespace Serimetry.Tests.Core;

public class GeometryTests
{
    private static Mat3 Rotation(double ax, double ay, double az)
    {
        var rx = new Mat3(1, 0, 0, 0, Math.Cos(ax), -Math.Sin(ax), 0, Math.Sin(ax), Math.Cos(ax));
        var ry = new Mat3(Math.Cos(ay), 0, Math.Sin(ay), 0, 1, 0, -Math.Sin(ay), 0, Math.Cos(ay));
        var rz = new Mat3(Math.Cos(az), -Math.Sin(az), 0, Math.Sin(az), Math.Cos(az), 0, 0, 0, 1);
        return rz * ry * rx;
    }

    [Property(MaxTest = 200)]
    public void IndexToPhysicalRoundTrips(NormalFloat a, NormalFloat b, NormalFloat c, NormalFloat i, NormalFloat j, NormalFloat k)
    {
        var dir = Rotation(a.Get % 3, b.Get % 3, c.Get % 3);
        var g = new Geometry(new Size3(64, 48, 20), new Vec3(0.55, 0.7, 3.3), new Vec3(-40, 12.5, 7), dir);
        var idx = new Vec3(i.Get % 100, j.Get % 100, k.Get % 100);
        var back = g.PhysicalToIndex(g.IndexToPhysical(idx));
        Assert.True((back - idx).Norm < 1e-9, $"{idx} -> {back}");
    }

    [Fact]
    public void ObliqueSeriesGeometryPlacesVoxelsAlongItsAxes()
    {
        // The oblique reference series geometry (shared/reference/dicom/README.md, written by dcmtk's dump2dcm):
        // voxel (i, j, k) sits at origin + 0.8 i r + 0.9 j c + 2.5 k n.
        double s = Math.Sin(15 * Math.PI / 180), co = Math.Cos(15 * Math.PI / 180);
        var r = new Vec3(1, 0, 0);
        var col = new Vec3(0, co, s);
        var n = r.Cross(col);
        var g = new Geometry(new Size3(80, 64, 10), new Vec3(0.8, 0.9, 2.5), new Vec3(-32, -30, 12.5), Mat3.FromColumns(r, col, n));
        var center = g.CenterMm;
        Assert.Equal(-0.4, center.X, 1e-5);
        Assert.Equal(-5.527717, center.Y, 1e-5);
        Assert.Equal(30.704185, center.Z, 1e-5);
    }

    [Fact]
    public void RefusesAbsurdSizesBeforeAllocating()
    {
        var ex = Assert.Throws<InputLimitException>(() =>
            Geometry.Axial(new Size3(60000, 60000, 60000), new Vec3(1, 1, 1), Vec3.Zero));
        Assert.Contains("exceeds the limit", ex.Message);
    }

    [Fact]
    public void RejectsNonOrthonormalDirections()
    {
        Assert.Throws<GeometryMismatchException>(() =>
            new Geometry(new Size3(2, 2, 2), new Vec3(1, 1, 1), Vec3.Zero, new Mat3(1, 0, 0, 0.5, 1, 0, 0, 0, 1)));
    }

    [Fact]
    public void CongruenceToleratesRoundingButNotShifts()
    {
        var g = Geometry.Axial(new Size3(10, 10, 10), new Vec3(1, 1, 3), new Vec3(0, 0, 0));
        Assert.True(g.IsCongruentWith(g.With(originMm: new Vec3(1e-5, 0, 0))));
        Assert.False(g.IsCongruentWith(g.With(originMm: new Vec3(0.1, 0, 0))));
        var ex = Assert.Throws<GeometryMismatchException>(() => g.RequireCongruent(g.With(spacingMm: new Vec3(1, 1, 2.5)), "mask and image"));
        Assert.Contains("spacing", ex.Message);
    }
}
