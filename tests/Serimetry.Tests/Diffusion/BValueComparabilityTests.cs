using Serimetry.Engine.Diffusion;
using Xunit;

namespace Serimetry.Tests.Diffusion;

public sealed class BValueComparabilityTests
{
    [Fact]
    public void DifferentBValueSetsAreReported()
    {
        Assert.Null(BValueComparability.Compare([400, 800], [800, 400, 400]));
        var msg = BValueComparability.Compare([400, 800], [500, 1000]);
        Assert.NotNull(msg);
        Assert.Contains("400/800", msg);
        Assert.Contains("500/1000", msg);
    }
}
