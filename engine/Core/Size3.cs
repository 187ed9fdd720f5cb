namespace Serimetry.Engine.Core;

/// <summary>Voxel counts along the x (column, fastest), y (row) and z (slice) index axes.</summary>
public readonly record struct Size3(int X, int Y, int Z)
{
    public long Count => (long)X * Y * Z;

    public int this[int axis] => axis switch
    {
        0 => X,
        1 => Y,
        2 => Z,
        _ => throw new ArgumentOutOfRangeException(nameof(axis)),
    };

    public int[] ToArray() => [X, Y, Z];

    public override string ToString() => $"{X}x{Y}x{Z}";
}
