namespace Serimetry.Engine.Core;

/// <summary>An integer voxel index (i along x, j along y, k along z).</summary>
public readonly record struct VoxelIndex(int I, int J, int K)
{
    public Vec3 ToContinuous() => new(I, J, K);
}
