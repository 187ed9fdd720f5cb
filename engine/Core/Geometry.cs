using System.Globalization;

namespace Serimetry.Engine.Core;

/// <summary>
/// Where a voxel grid sits in DICOM patient space (LPS, millimetres): size, spacing along each index
/// axis, the position of voxel (0,0,0)'s centre, and the direction cosines of the index axes (the
/// columns of <see cref="Direction"/>). Immutable and validated at construction.
/// Physical point p of continuous index c: p = Origin + Direction · diag(Spacing) · c.
/// </summary>
public sealed class Geometry : IEquatable<Geometry>
{
    private readonly Mat3 _indexToPhysical;
    private readonly Mat3 _physicalToIndex;

    public Geometry(Size3 size, Vec3 spacingMm, Vec3 originMm, Mat3 direction)
    {
        Limits.CheckSize(size, "image geometry");
        if (!(spacingMm.X > 0 && spacingMm.Y > 0 && spacingMm.Z > 0) || !spacingMm.IsFinite)
            throw new GeometryMismatchException($"voxel spacing {spacingMm} mm must be positive and finite", "image geometry");
        if (!originMm.IsFinite)
            throw new GeometryMismatchException($"origin {originMm} is not finite", "image geometry");
        if (!direction.IsOrthonormal(1e-3))
            throw new GeometryMismatchException($"direction cosines {direction} are not orthonormal", "image geometry",
                "the image orientation must be a rotation (or a rotation with one flipped axis)");
        Size = size;
        SpacingMm = spacingMm;
        OriginMm = originMm;
        Direction = direction;
        _indexToPhysical = direction * Mat3.Diagonal(spacingMm);
        _physicalToIndex = _indexToPhysical.Inverse();
    }

    /// <summary>An axis-aligned geometry (identity direction).</summary>
    public static Geometry Axial(Size3 size, Vec3 spacingMm, Vec3 originMm) => new(size, spacingMm, originMm, Mat3.Identity);

    public Size3 Size { get; }
    public Vec3 SpacingMm { get; }
    public Vec3 OriginMm { get; }

    /// <summary>Direction cosines: column c is the unit LPS direction of index axis c.</summary>
    public Mat3 Direction { get; }

    /// <summary>Direction · diag(spacing): maps an index step to a physical step in mm.</summary>
    public Mat3 IndexToPhysicalMatrix => _indexToPhysical;

    /// <summary>The inverse of <see cref="IndexToPhysicalMatrix"/>.</summary>
    public Mat3 PhysicalToIndexMatrix => _physicalToIndex;

    public long VoxelCount => Size.Count;

    public double VoxelVolumeMm3 => SpacingMm.X * SpacingMm.Y * SpacingMm.Z;

    /// <summary>The LPS point (mm) at a continuous index.</summary>
    public Vec3 IndexToPhysical(Vec3 continuousIndex) => OriginMm + _indexToPhysical * continuousIndex;

    /// <summary>The LPS point (mm) at a voxel centre.</summary>
    public Vec3 IndexToPhysical(int i, int j, int k) => IndexToPhysical(new Vec3(i, j, k));

    /// <summary>The continuous index of an LPS point (mm).</summary>
    public Vec3 PhysicalToIndex(Vec3 pointMm) => _physicalToIndex * (pointMm - OriginMm);

    /// <summary>The physical centre of the grid (midpoint between first and last voxel centres).</summary>
    public Vec3 CenterMm => IndexToPhysical(new Vec3((Size.X - 1) / 2.0, (Size.Y - 1) / 2.0, (Size.Z - 1) / 2.0));

    /// <summary>Whether a continuous index lies within the voxel-centre box extended by half a voxel.</summary>
    public bool ContainsIndex(Vec3 c) =>
        c.X >= -0.5 && c.Y >= -0.5 && c.Z >= -0.5 && c.X <= Size.X - 0.5 && c.Y <= Size.Y - 0.5 && c.Z <= Size.Z - 0.5;

    /// <summary>
    /// Whether two grids occupy the same space: same size, and spacing, origin and direction equal within
    /// <paramref name="toleranceMm"/> (spacing and origin) and the same tolerance scaled by the extent for direction.
    /// </summary>
    public bool IsCongruentWith(Geometry other, double toleranceMm = 1e-3)
    {
        if (Size != other.Size) return false;
        if ((SpacingMm - other.SpacingMm).Norm > toleranceMm) return false;
        if ((OriginMm - other.OriginMm).Norm > toleranceMm) return false;
        double extent = Math.Max(1, (new Vec3(Size.X, Size.Y, Size.Z).Scale(SpacingMm)).Norm);
        return Direction.MaxAbsDifference(other.Direction) * extent <= toleranceMm;
    }

    /// <summary>Throws a <see cref="GeometryMismatchException"/> that prints both geometries when they differ.</summary>
    public void RequireCongruent(Geometry other, string what, double toleranceMm = 1e-3)
    {
        if (!IsCongruentWith(other, toleranceMm))
            throw new GeometryMismatchException(
                $"{what} do not share a voxel grid: {Describe()} vs {other.Describe()}",
                what, "resample one onto the other's grid, or supply inputs on the same grid");
    }

    /// <summary>A copy with another size/spacing/origin/direction.</summary>
    public Geometry With(Size3? size = null, Vec3? spacingMm = null, Vec3? originMm = null, Mat3? direction = null) =>
        new(size ?? Size, spacingMm ?? SpacingMm, originMm ?? OriginMm, direction ?? Direction);

    public string Describe() => string.Create(CultureInfo.InvariantCulture,
        $"size {Size}, spacing {SpacingMm} mm, origin {OriginMm} mm, direction {Direction}");

    public bool Equals(Geometry? other) => other is not null && Size == other.Size && SpacingMm == other.SpacingMm
        && OriginMm == other.OriginMm && Direction == other.Direction;

    public override bool Equals(object? obj) => Equals(obj as Geometry);

    public override int GetHashCode() => HashCode.Combine(Size, SpacingMm, OriginMm);

    public override string ToString() => Describe();
}
