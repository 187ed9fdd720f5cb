using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Xunit;

namespace Serimetry.Tests.Measures;

/// <summary>Dice and centroid shift of overlapping spheres (truth: sphere–sphere intersection geometry).</summary>
public class MaskAgreementTests
{
    [Fact]
    public void OffsetSpheresHaveTheLensOverlapDice()
    {
        // Src: volume of the lens where two spheres of radius r with centres d apart overlap:
        // V = π(4r + d)(2r − d)²/12 (sphere–sphere intersection, standard solid geometry), so
        // Dice = 2V / (2·4/3·π·r³). Centroids are d apart. Tolerance = voxel discretisation.
        const double r = 8, d = 4;
        var c = new Vec3(1, 2, 3);
        var g = SyntheticMasks.Centred(new Size3(70, 70, 50), new Vec3(0.5, 0.5, 0.8), SyntheticMasks.Rotation(new Vec3(1, 1, 0), 30), c);
        var shiftDir = new Vec3(0.6, 0, 0.8);
        var a = SyntheticMasks.Ellipsoid(g, c, new Vec3(r, r, r));
        var b = SyntheticMasks.Ellipsoid(g, c + d * shiftDir, new Vec3(r, r, r));
        var result = MaskAgreement.Compare(a, b);
        double lens = Math.PI * (4 * r + d) * Math.Pow(2 * r - d, 2) / 12;
        double dice = lens / (4.0 / 3 * Math.PI * r * r * r);
        Assert.Equal(dice, result.Dice!.Value, 0.01);
        Assert.Equal(d, result.CentroidShiftMm!.Value, 0.05);
        Assert.Equal(1.0, MaskAgreement.Compare(a, a).Dice);
    }

    [Fact]
    public void EmptyAndMismatchedMasks()
    {
        var g = Geometry.Axial(new Size3(4, 4, 4), new Vec3(1, 1, 1), Vec3.Zero);
        var empty = new Volume<byte>(g);
        Assert.Null(MaskAgreement.Compare(empty, empty).Dice);
        Assert.Null(MaskAgreement.Compare(empty, empty).CentroidShiftMm);
        var other = new Volume<byte>(g.With(spacingMm: new Vec3(2, 2, 2)));
        Assert.Throws<GeometryMismatchException>(() => MaskAgreement.Compare(empty, other));
    }
}
