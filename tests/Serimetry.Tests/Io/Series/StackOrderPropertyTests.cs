using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Tests.Io.Series;

public class StackOrderPropertyTests
{
    /// <summary>
    /// Whatever order the files arrive in and whatever the tilt, the stack is ordered along the normal and its
    /// geometry maps slice k's (0,0) pixel to that slice's Image Position (the truth it was built from).
    /// </summary>
    [Property(MaxTest = 100)]
    public bool OrderAndGeometryDoNotDependOnInputOrder(int seed, byte tiltByte, PositiveInt stepTenths)
    {
        double tilt = tiltByte % 90;
        double step = 0.5 + stepTenths.Get % 60 / 10.0;
        var slices = SyntheticSlices.Oblique(count: 12, stepMm: step, tiltDeg: tilt);
        var rng = new Random(seed);
        var shuffled = slices.OrderBy(_ => rng.Next()).ToList();
        var stack = SeriesAssembler.Assemble(shuffled)[0].Series[0].MainStacks[0];
        var g = stack.Geometry!;
        for (int k = 0; k < slices.Count; k++)
        {
            if (!ReferenceEquals(stack.Slices[k], slices[k])) return false;
            if ((g.IndexToPhysical(0, 0, k) - slices[k].ImagePositionPatient!.Value).Norm > 1e-9) return false;
        }
        return stack.IsRegular && Math.Abs(g.SpacingMm.Z - step) < 1e-9;
    }
}
