using System.Globalization;
using Serimetry.Engine.Core;

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

    /// <summary>Checks the mask lies on the fixed grid and is not empty; dilates it when asked.</summary>
    public static Volume<byte>? PrepareMask(Volume<byte>? mask, Geometry fixedGeometry, double dilationMm)
    {
        if (mask is null) return null;
        fixedGeometry.RequireCongruent(mask.Geometry, "the fixed image and the fixed mask");
        long count = 0;
        foreach (var b in mask.Voxels) if (b != 0) count++;
        if (count == 0)
            throw new RegistrationException("the fixed mask is empty (no non-zero voxel)",
                "supply a mask that outlines the region to align (e.g. the gland), or register without a mask");
        return dilationMm > 0 ? MaskOperations.DilateBox(mask, dilationMm) : mask;
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
}
