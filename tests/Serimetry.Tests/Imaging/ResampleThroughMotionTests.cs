using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Imaging;

/// <summary>Resampling through a transform (property: identity resampling returns the input, common practice).</summary>
public class ResampleThroughMotionTests
{
    private static readonly Geometry Grid = RegistrationPhantom.T2Grid(48, 48, 12, 2, 3);

    [Fact]
    public void IdentityResamplingReturnsTheInput()
    {
        var image = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0.02, 5, sliceSubsamples: 1);
        var same = Resampler.Resample(image, Grid, AffineTransform.Identity, Interpolation.Linear);
        for (int i = 0; i < image.Voxels.Length; i++) Assert.Equal(image.Voxels[i], same.Voxels[i], 5);
        var mask = RegistrationPhantom.GlandMask(Grid);
        Assert.Equal(mask.Voxels, Resampler.ResampleMask(mask, Grid, AffineTransform.Identity).Voxels);
    }

    [Fact]
    public void ResamplingThroughTheTrueMotionUndoesIt()
    {
        var truth = RegistrationPhantom.Rigid(0, 0, 0, new Vec3(4, -6, 3)); // whole-voxel shift: exact on this grid
        var moved = RegistrationPhantom.Render(Grid, truth, PhantomContrast.T2w, 0, 5, sliceSubsamples: 1);
        var baseline = RegistrationPhantom.Render(Grid, AffineTransform.Identity, PhantomContrast.T2w, 0, 5, sliceSubsamples: 1);
        var back = Resampler.Resample(moved, Grid, truth, Interpolation.Linear, float.NaN);
        int compared = 0;
        for (int i = 0; i < back.Voxels.Length; i++)
        {
            if (float.IsNaN(back.Voxels[i])) continue;
            var idx = i;
            int x = idx % Grid.Size.X, y = idx / Grid.Size.X % Grid.Size.Y, z = idx / (Grid.Size.X * Grid.Size.Y);
            if (x < 3 || y < 3 || z < 2 || x >= Grid.Size.X - 3 || y >= Grid.Size.Y - 3 || z >= Grid.Size.Z - 2) continue;
            Assert.Equal(baseline.Voxels[i], back.Voxels[i], 4);
            compared++;
        }
        Assert.True(compared > 1000);
    }
}
