namespace Serimetry.Engine.Core;

/// <summary>Safety limits checked before any allocation driven by input data.</summary>
public static class Limits
{
    /// <summary>Largest voxel count of one volume: 2^28 (1 GiB as float32), far above any prostate MRI series.</summary>
    public const long MaxVoxels = 1L << 28;

    /// <summary>Largest extent along one axis.</summary>
    public const int MaxAxisLength = 65536;

    /// <summary>Throws <see cref="InputLimitException"/> when a size is absurd.</summary>
    public static void CheckSize(Size3 size, string where)
    {
        if (size.X <= 0 || size.Y <= 0 || size.Z <= 0)
            throw new InputFormatException($"image size {size} has a non-positive extent", where);
        if (size.X > MaxAxisLength || size.Y > MaxAxisLength || size.Z > MaxAxisLength || size.Count > MaxVoxels)
            throw new InputLimitException(
                $"image size {size} ({size.Count:N0} voxels) exceeds the limit of {MaxVoxels:N0} voxels / {MaxAxisLength} per axis",
                where, "check the file is not corrupt; Serimetry refuses such sizes before allocating memory");
    }
}
