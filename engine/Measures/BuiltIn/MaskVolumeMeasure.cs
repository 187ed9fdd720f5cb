using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>
/// <c>lesion.volume</c> / <c>gland.volume</c>, in mL on the mask's own grid (no resampling): the sum of the
/// lesion's partial-volume occupancy × voxel volume when <see cref="VisitContext.LesionOccupancy"/> is given (the
/// re-fitted lesion), else the number of non-zero mask voxels × voxel volume (IBSI volume by voxel counting,
/// YEKZ). docs/measures.md defines both and their errors. For the gland,
/// <see cref="VisitContext.GlandVolumeMlOverride"/> is used when set.
/// </summary>
public sealed class MaskVolumeMeasure(MaskKind kind) : BuiltInMeasure
{
    public override string Id => kind == MaskKind.Lesion ? "lesion.volume" : "gland.volume";
    public override string Unit => "mL";
    public override string Description => $"{Name} volume: partial-volume occupancy (or voxel count) × voxel volume on the mask's grid.";
    public override string? IbsiCode => "YEKZ";
    public override MeasureInputs Inputs => kind == MaskKind.Lesion ? MeasureInputs.LesionMask : MeasureInputs.GlandMask;
    public override ErrorScale ErrorScale => ErrorScale.Log;
    public override TrendScale TrendScale => TrendScale.Log;

    private string Name => kind == MaskKind.Lesion ? "lesion" : "gland";

    public override MeasureValue Measure(VisitContext context)
    {
        // A gland volume from elsewhere (the Jacobian of a deformable alignment, VisitContext) wins over voxel
        // counting of a propagated outline, which a rigid or affine carry cannot resize.
        if (kind == MaskKind.Gland && context.GlandVolumeMlOverride is double given)
            return MeasureValue.Ok(this, given, Provenance(("source", "gland volume given by the caller (deformable alignment Jacobian)")));
        var mask = kind == MaskKind.Lesion ? context.LesionMask : context.GlandMask;
        if (!TryMask(mask, Name, out var m, out var skip)) return skip;
        int n = MaskGrid.Count(m.Voxels);
        double voxelMl = m.Geometry.VoxelVolumeMm3 / 1000.0;
        if (kind == MaskKind.Lesion && context.LesionOccupancy is { } occupancy)
        {
            occupancy.Geometry.RequireCongruent(m.Geometry, "lesion occupancy and lesion mask");
            return MeasureValue.Ok(this, Sum(occupancy.Voxels) * voxelMl, Provenance(("voxels", n), ("voxelCountMl", n * voxelMl),
                ("partialVolume", "occupancy from linear T2w mixing at the boundary"), ("grid", GridOf(m.Geometry))));
        }
        return MeasureValue.Ok(this, n * voxelMl, Provenance(("voxels", n), ("partialVolume", "none (voxel count)"), ("grid", GridOf(m.Geometry))));
    }

    /// <summary>Compensated (Kahan) sum of the occupancy fractions.</summary>
    private static double Sum(ReadOnlySpan<float> fractions)
    {
        double sum = 0, c = 0;
        foreach (float v in fractions)
        {
            if (v == 0) continue;
            double y = v - c, s = sum + y;
            c = s - sum - y;
            sum = s;
        }
        return sum;
    }
}
