using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;

namespace Serimetry.Engine.Registration;

/// <summary>Checks and prepares the images and mask before any optimisation (bad input never reaches the loop).</summary>
internal static class RegistrationInputs
{
    /// <summary>
    /// Returns the image, or a copy whose non-finite voxels are replaced by the smallest finite value (with a
    /// warning). Throws when no voxel is finite or the image is constant.
    /// </summary>
    public static Volume<float> Sanitize(Volume<float> image, string name, List<string> warnings)
    {
        var v = image.Voxels;
        float min = float.PositiveInfinity, max = float.NegativeInfinity;
        long bad = 0;
        foreach (var x in v)
        {
            if (!float.IsFinite(x)) { bad++; continue; }
            if (x < min) min = x;
            if (x > max) max = x;
        }
        if (bad == v.LongLength)
            throw new RegistrationException($"the {name} image has no finite voxel value", $"check the {name} series was decoded correctly");
        if (max - min <= 0)
            throw new RegistrationException(
                string.Create(CultureInfo.InvariantCulture, $"the {name} image is constant (every voxel is {min:G6}); there is nothing to align"),
                $"check the {name} series is the intended image and not blank");
        if (bad == 0) return image;
        warnings.Add(string.Create(CultureInfo.InvariantCulture,
            $"{bad} non-finite voxels in the {name} image were replaced by its minimum ({min:G6}) before registration"));
        var copy = (float[])v.Clone();
        for (int i = 0; i < copy.Length; i++) if (!float.IsFinite(copy[i])) copy[i] = min;
        return new Volume<float>(image.Geometry, copy);
    }

    /// <summary>Checks the mask lies on its image's grid and is not empty; dilates it when asked.</summary>
    public static Volume<byte>? PrepareMask(Volume<byte>? mask, Geometry imageGeometry, double dilationMm, string which = "fixed")
    {
        if (mask is null) return null;
        imageGeometry.RequireCongruent(mask.Geometry, $"the {which} image and the {which} mask");
        long count = 0;
        foreach (var b in mask.Voxels) if (b != 0) count++;
        if (count == 0)
            throw new RegistrationException($"the {which} mask is empty (no non-zero voxel)",
                "supply a mask that outlines the region to align (e.g. the gland), or register without a mask");
        return dilationMm > 0 ? MaskOps.DilateBox(mask, dilationMm) : mask;
    }

    /// <summary>Checks a lesion mask lies on the fixed grid and is not empty.</summary>
    public static Volume<byte>? PrepareLesion(Volume<byte>? lesion, Geometry fixedGeometry)
    {
        if (lesion is null) return null;
        fixedGeometry.RequireCongruent(lesion.Geometry, "the fixed image and the lesion mask");
        foreach (var b in lesion.Voxels) if (b != 0) return lesion;
        throw new RegistrationException("the lesion mask is empty (no non-zero voxel)",
            "supply the baseline lesion outline, or register without a lesion mask");
    }

    /// <summary>
    /// Throws when no part of the fixed region maps inside the moving image under the starting transform,
    /// which no optimizer can repair.
    /// </summary>
    public static void RequireOverlap(Volume<float> fixedImage, Volume<byte>? mask, Volume<float> moving, AffineTransform start)
    {
        var fg = fixedImage.Geometry;
        var mg = moving.Geometry;
        int step = Math.Max(1, (int)Math.Cbrt(fg.VoxelCount / 20000.0));
        long inside = 0, total = 0;
        for (int k = 0; k < fg.Size.Z; k += Math.Max(1, Math.Min(step, fg.Size.Z / 4)))
            for (int j = 0; j < fg.Size.Y; j += step)
                for (int i = 0; i < fg.Size.X; i += step)
                {
                    if (mask is not null && mask[i, j, k] == 0) continue;
                    total++;
                    if (mg.ContainsIndex(mg.PhysicalToIndex(start.TransformPoint(fg.IndexToPhysical(i, j, k))))) inside++;
                }
        if (total > 0 && inside == 0)
            throw new RegistrationException(
                $"the images do not overlap in physical space (fixed {fg.Describe()}; moving {mg.Describe()})",
                "check both series belong to the same patient and frame of reference; for different scanner positions use a centre-of-mass or geometry-centre initialisation");
    }

    /// <summary>Margin kept around the (dilated) mask: more than 3σ of the coarsest default smoothing.</summary>
    internal const double FixedCropMarginMm = 10;

    /// <summary>How far (mm) the optimisation may move the mask region from its starting position and still see moving data.</summary>
    internal const double MovingCropMarginMm = 40;

    /// <summary>
    /// With a mask, only the mask's neighbourhood of the fixed image and the part of the moving image it can
    /// reach (the box mapped by the starting transform, grown by <see cref="MovingCropMarginMm"/>) take part,
    /// so the pyramid is built on a fraction of a large field of view. Results equal those on the full
    /// images except where the motion exceeds that margin.
    /// </summary>
    public static (Volume<float> Fixed, Volume<byte>? Mask, Volume<float> Moving, Volume<byte>? MovingMask) CropToMask(
        Volume<float> fixedImage, Volume<byte>? mask, Volume<float> moving, Volume<byte>? movingMask, AffineTransform start)
    {
        if (mask is null || MaskOperations.BoundingBox(mask, FixedCropMarginMm) is not { } box) return (fixedImage, mask, moving, movingMask);
        var f = MaskOperations.Crop(fixedImage, box.Lo, box.Hi);
        var k = MaskOperations.Crop(mask, box.Lo, box.Hi);
        var fg = fixedImage.Geometry;
        var mg = moving.Geometry;
        double lx = double.MaxValue, ly = double.MaxValue, lz = double.MaxValue, hx = double.MinValue, hy = double.MinValue, hz = double.MinValue;
        for (int c = 0; c < 8; c++)
        {
            var corner = new Vec3((c & 1) == 0 ? box.Lo.I : box.Hi.I, (c & 2) == 0 ? box.Lo.J : box.Hi.J, (c & 4) == 0 ? box.Lo.K : box.Hi.K);
            var idx = mg.PhysicalToIndex(start.TransformPoint(fg.IndexToPhysical(corner)));
            lx = Math.Min(lx, idx.X); ly = Math.Min(ly, idx.Y); lz = Math.Min(lz, idx.Z);
            hx = Math.Max(hx, idx.X); hy = Math.Max(hy, idx.Y); hz = Math.Max(hz, idx.Z);
        }
        var sp = mg.SpacingMm;
        int Lo(double v, double spacing) => (int)Math.Floor(v - MovingCropMarginMm / spacing);
        int Hi(double v, double spacing) => (int)Math.Ceiling(v + MovingCropMarginMm / spacing);
        var lo = new VoxelIndex(Math.Clamp(Lo(lx, sp.X), 0, mg.Size.X - 1), Math.Clamp(Lo(ly, sp.Y), 0, mg.Size.Y - 1), Math.Clamp(Lo(lz, sp.Z), 0, mg.Size.Z - 1));
        var hi = new VoxelIndex(Math.Clamp(Hi(hx, sp.X), 0, mg.Size.X - 1), Math.Clamp(Hi(hy, sp.Y), 0, mg.Size.Y - 1), Math.Clamp(Hi(hz, sp.Z), 0, mg.Size.Z - 1));
        return (f, k, MaskOperations.Crop(moving, lo, hi), movingMask is null ? null : MaskOperations.Crop(movingMask, lo, hi));
    }
}
