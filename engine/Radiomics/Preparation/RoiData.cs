using Serimetry.Engine.Core;

namespace Serimetry.Engine.Radiomics.Preparation;

/// <summary>
/// The processed ROI, cropped to the mask's bounding box (plus a margin for the local-intensity sphere):
/// intensities, the morphological mask, the (re-segmented) intensity mask and discretised grey levels.
/// Arrays are x fastest, then y, then z, like <see cref="Volume{T}"/>.
/// </summary>
internal sealed class RoiData
{
    public required int Nx { get; init; }
    public required int Ny { get; init; }
    public required int Nz { get; init; }

    /// <summary>Voxel spacing in mm along x, y, z.</summary>
    public required Vec3 SpacingMm { get; init; }

    /// <summary>Image intensities of every voxel of the crop (inside and outside the ROI).</summary>
    public required double[] Intensity { get; init; }

    /// <summary>1 where the voxel belongs to the morphological mask.</summary>
    public required byte[] Morph { get; init; }

    /// <summary>1 where the voxel belongs to the intensity mask (after re-segmentation).</summary>
    public required byte[] InRoi { get; init; }

    /// <summary>Discretised grey level 1..<see cref="BinCount"/> inside the intensity mask, 0 outside.</summary>
    public required int[] Levels { get; init; }

    /// <summary>N_g, the number of discretisation bins.</summary>
    public required int BinCount { get; init; }

    /// <summary>The IVH discretisation of the intensity mask.</summary>
    public required DiscreteLevels Ivh { get; init; }

    public int Count => Nx * Ny * Nz;

    public int Index(int x, int y, int z) => x + Nx * (y + Ny * z);

    /// <summary>Number of voxels in the intensity mask.</summary>
    public int RoiVoxelCount { get; init; }

    /// <summary>Number of voxels in the morphological mask.</summary>
    public int MorphVoxelCount { get; init; }
}

/// <summary>Discretised levels with the affine map from level i to a representative intensity: offset + step·i.</summary>
internal sealed record DiscreteLevels(int[] Levels, int BinCount, double Offset, double Step)
{
    public double ValueOf(int level) => Offset + Step * level;
}
