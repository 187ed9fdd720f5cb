using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>Target grids for resampling.</summary>
public static class ResampleGrid
{
    /// <summary>
    /// A grid with new voxel spacing over the same region, as the IBSI interpolation rules define it
    /// (IBSI 1 reference manual, "Interpolation"; facts.md §8): same direction, size n_b = ⌈n_a·s_a / s_b⌉ per
    /// axis, and grid centres aligned (the physical centre of the new grid equals that of the old one).
    /// </summary>
    public static Geometry WithSpacing(Geometry source, Vec3 spacingMm)
    {
        ArgumentNullException.ThrowIfNull(source);
        if (!(spacingMm.X > 0 && spacingMm.Y > 0 && spacingMm.Z > 0) || !spacingMm.IsFinite)
            throw new InvalidParameterException($"resampling spacing {spacingMm} mm must be positive and finite", "resampling grid");
        var size = new Size3(Count(source.Size.X, source.SpacingMm.X, spacingMm.X),
            Count(source.Size.Y, source.SpacingMm.Y, spacingMm.Y),
            Count(source.Size.Z, source.SpacingMm.Z, spacingMm.Z));
        Limits.CheckSize(size, "resampling grid");
        var halfExtent = source.Direction * Mat3.Diagonal(spacingMm) * new Vec3((size.X - 1) / 2.0, (size.Y - 1) / 2.0, (size.Z - 1) / 2.0);
        return new Geometry(size, spacingMm, source.CenterMm - halfExtent, source.Direction);
    }

    /// <summary>⌈n·s_a/s_b⌉, ignoring floating-point excess below 1e-9 voxel (3.0000000001 counts as 3).</summary>
    private static int Count(int n, double from, double to)
    {
        double exact = n * from / to;
        double count = Math.Ceiling(exact - 1e-9);
        if (count > Limits.MaxAxisLength)
            throw new InputLimitException($"resampling to {to} mm gives {count:N0} voxels along one axis", "resampling grid",
                "choose a coarser spacing");
        return Math.Max(1, (int)count);
    }
}
