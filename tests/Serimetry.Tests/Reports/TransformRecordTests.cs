using Serimetry.Engine.Core;
using Serimetry.Engine.Reports;
using Xunit;

namespace Serimetry.Tests.Reports;

/// <summary>Transforms stored in change.json come back as the same mapping of points.</summary>
public class TransformRecordTests
{
    [Fact]
    public void AffineRoundTripsThroughTheRecord()
    {
        var rot = Serimetry.Tests.Measures.SyntheticMasks.Rotation(new Vec3(0.2, 0.3, 1), 7);
        var t = new AffineTransform(rot, new Vec3(1.5, -2, 3.25));
        var back = TransformRecord.FromAffine(t).ToAffine()!;
        var p = new Vec3(10, -20, 30);
        Assert.True((t.TransformPoint(p) - back.TransformPoint(p)).Norm < 1e-12);
        Assert.Null(new TransformRecord("bspline", null, "bspline.json").ToAffine());
        var id = TransformRecord.Identity.ToAffine()!;
        Assert.Equal(p, id.TransformPoint(p));
    }
}
