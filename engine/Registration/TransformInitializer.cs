using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>Starting point of the optimisation: the centre of rotation and an initial translation.</summary>
internal static class TransformInitializer
{
    /// <summary>
    /// The centre of rotation: the fixed mask's centroid when there is a mask (rotations about the gland
    /// move it least), otherwise the fixed image's intensity centre of mass.
    /// </summary>
    public static Vec3 RotationCenter(Volume<float> fixedImage, Volume<byte>? mask) =>
        mask is not null ? MaskOperations.Centroid(mask) : CenterOfMass(fixedImage);

    /// <summary>The starting map (fixed → moving) for the chosen initialisation.</summary>
    public static AffineTransform Start(InitializationKind kind, Volume<float> fixedImage, Volume<float> moving)
    {
        switch (kind)
        {
            case InitializationKind.Identity:
                return AffineTransform.Identity;
            case InitializationKind.GeometryCenters:
                return new AffineTransform(Mat3.Identity, moving.Geometry.CenterMm - fixedImage.Geometry.CenterMm);
            case InitializationKind.CentersOfMass:
                return new AffineTransform(Mat3.Identity, CenterOfMass(moving) - CenterOfMass(fixedImage));
            case InitializationKind.Moments:
                var (cf, mf) = PrincipalAxes.Compute(fixedImage);
                var (cm, mm) = PrincipalAxes.Compute(moving);
                var r = PrincipalAxes.AlignAxes(mf, mm);
                return new AffineTransform(r, cm - r * cf);
            default:
                throw new ArgumentOutOfRangeException(nameof(kind));
        }
    }

    /// <summary>
    /// Intensity-weighted centroid of voxels brighter than the image mean (so a noisy background does not
    /// pull it towards the grid centre).
    /// </summary>
    public static Vec3 CenterOfMass(Volume<float> image)
    {
        var v = image.Voxels;
        double mean = 0;
        foreach (var x in v) mean += x;
        mean /= v.Length;
        double sw = 0, sx = 0, sy = 0, sz = 0;
        var s = image.Size;
        int idx = 0;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++, idx++)
                {
                    double w = v[idx] - mean;
                    if (w <= 0) continue;
                    sw += w; sx += w * i; sy += w * j; sz += w * k;
                }
        return sw <= 0 ? image.Geometry.CenterMm : image.Geometry.IndexToPhysical(new Vec3(sx / sw, sy / sw, sz / sw));
    }
}
