using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Pyramid;

/// <summary>The fixed image, mask and moving image prepared for one pyramid level.</summary>
internal sealed record ResolutionLevel(Volume<float> Fixed, Volume<byte>? Mask, Volume<float> Moving,
    Size3 FixedShrink, Size3 MovingShrink, Vec3 FixedSigmaMm, Volume<byte>? MovingMask = null)
{
    /// <summary>
    /// Smooths and shrinks both images for a level whose target spacing is
    /// <paramref name="shrinkFactor"/> × <paramref name="finestSpacingMm"/>; each axis of each image shrinks by
    /// its own integer factor so anisotropic voxels become closer to isotropic rather than coarser still.
    /// </summary>
    public static ResolutionLevel Build(Volume<float> fixedImage, Volume<byte>? mask, Volume<float> moving,
        double shrinkFactor, double? sigmaMm, double finestSpacingMm, int maxThreads, Volume<byte>? movingMask = null)
    {
        double target = shrinkFactor * finestSpacingMm;
        var fShrink = ShrinkFor(fixedImage.Geometry, target);
        var mShrink = ShrinkFor(moving.Geometry, target);
        var fSigma = SigmaFor(fixedImage.Geometry, fShrink, sigmaMm);
        var mSigma = SigmaFor(moving.Geometry, mShrink, sigmaMm);
        var f = Downsampler.Shrink(GaussianSmoothing.Smooth(fixedImage, fSigma, maxThreads), fShrink);
        var m = Downsampler.Shrink(GaussianSmoothing.Smooth(moving, mSigma, maxThreads), mShrink);
        var k = mask is null ? null : Downsampler.ShrinkMask(mask, fShrink);
        var mk = movingMask is null ? null : Downsampler.ShrinkMask(movingMask, mShrink);
        return new ResolutionLevel(f, k, m, new Size3(fShrink.X, fShrink.Y, fShrink.Z), new Size3(mShrink.X, mShrink.Y, mShrink.Z), fSigma, mk);
    }

    private static (int X, int Y, int Z) ShrinkFor(Geometry g, double targetMm)
    {
        int S(int axis) => Math.Max(1, Math.Min(g.Size[axis], (int)Math.Round(targetMm / g.SpacingMm[axis])));
        return (S(0), S(1), S(2));
    }

    private static Vec3 SigmaFor(Geometry g, (int X, int Y, int Z) shrink, double? sigmaMm)
    {
        if (sigmaMm is { } s) return new Vec3(s, s, s);
        double A(int axis, int f) => f > 1 ? 0.5 * f * g.SpacingMm[axis] : 0;
        return new Vec3(A(0, shrink.X), A(1, shrink.Y), A(2, shrink.Z));
    }
}
