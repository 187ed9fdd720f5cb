using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>
/// <c>lesion.volume</c> / <c>gland.volume</c>: number of non-zero mask voxels × voxel volume, in mL,
/// counted on the mask's own grid (no resampling). Binary masks: no partial-volume weighting
/// (docs/measures.md discusses the resulting boundary error). Related IBSI feature: volume (voxel
/// counting) YEKZ. For the gland, <see cref="VisitContext.GlandVolumeMlOverride"/> is used when set.
/// </summary>
public sealed class MaskVolumeMeasure(MaskKind kind) : BuiltInMeasure
{
    public override string Id => kind == MaskKind.Lesion ? "lesion.volume" : "gland.volume";
    public override string Unit => "mL";
    public override string Description => $"{Name} volume: voxel count × voxel volume on the mask's grid.";
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
        double ml = n * m.Geometry.VoxelVolumeMm3 / 1000.0;
        return MeasureValue.Ok(this, ml, Provenance(("voxels", n), ("grid", GridOf(m.Geometry))));
    }
}
