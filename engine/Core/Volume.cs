namespace Serimetry.Engine.Core;

/// <summary>
/// A 3D image: voxels stored contiguously with x fastest, then y, then z, plus the <see cref="Geometry"/>
/// that places them in patient space. Masks are <c>Volume&lt;byte&gt;</c> (0 outside, label values inside).
/// </summary>
public sealed class Volume<T> where T : unmanaged
{
    public Volume(Geometry geometry, T[] voxels)
    {
        ArgumentNullException.ThrowIfNull(geometry);
        ArgumentNullException.ThrowIfNull(voxels);
        if (voxels.LongLength != geometry.VoxelCount)
            throw new ArgumentException($"Voxel buffer has {voxels.LongLength} elements; geometry {geometry.Size} needs {geometry.VoxelCount}.");
        Geometry = geometry;
        Voxels = voxels;
    }

    /// <summary>A zero-filled volume on the given grid.</summary>
    public Volume(Geometry geometry) : this(geometry, new T[checked((int)geometry.VoxelCount)])
    {
    }

    public Geometry Geometry { get; }

    /// <summary>The voxel buffer, x fastest.</summary>
    public T[] Voxels { get; }

    public Span<T> Span => Voxels;

    public Size3 Size => Geometry.Size;

    public int LinearIndex(int i, int j, int k) => i + Size.X * (j + Size.Y * k);

    public ref T this[int i, int j, int k] => ref Voxels[LinearIndex(i, j, k)];

    /// <summary>One z-slice as a span.</summary>
    public Span<T> Slice(int k) => Voxels.AsSpan(k * Size.X * Size.Y, Size.X * Size.Y);

    /// <summary>A new volume on the same grid with a copy of the voxels.</summary>
    public Volume<T> Clone() => new(Geometry, (T[])Voxels.Clone());

    /// <summary>A new zero-filled volume of another element type on the same grid.</summary>
    public Volume<TOther> Like<TOther>() where TOther : unmanaged => new(Geometry);
}
