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

    /// <summary>The initial translation (moving − fixed) for the chosen initialisation.</summary>
    public static Vec3 InitialTranslation(InitializationKind kind, Volume<float> fixedImage, Volume<float> moving) => kind switch
    {
        InitializationKind.Identity => Vec3.Zero,
        InitializationKind.GeometryCenters => moving.Geometry.CenterMm - fixedImage.Geometry.CenterMm,
        InitializationKind.CentersOfMass => CenterOfMass(moving) - CenterOfMass(fixedImage),
        _ => throw new ArgumentOutOfRangeException(nameof(kind)),
    };

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
