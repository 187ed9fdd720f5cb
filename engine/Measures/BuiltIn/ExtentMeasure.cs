using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>Patient axis along which an extent is taken (LPS: x = left-right, y = antero-posterior, z = cranio-caudal).</summary>
public enum PatientAxis
{
    LeftRight,
    AnteroPosterior,
    CranioCaudal,
}

/// <summary>
/// <c>lesion.diameter.lr/.ap/.cc</c> (and the gland's, used by the ellipsoid volume): extent (mm) of the
/// union of the mask's voxel boxes along one patient axis. Exact for the voxelised mask on any grid,
/// including oblique ones (see <c>MaskGrid.PatientExtentsMm</c>).
/// </summary>
public sealed class ExtentMeasure(MaskKind kind, PatientAxis axis) : BuiltInMeasure
{
    public override string Id => $"{(kind == MaskKind.Lesion ? "lesion" : "gland")}.diameter.{Suffix}";
    public override string Unit => "mm";
    public override string Description => $"Extent of the {(kind == MaskKind.Lesion ? "lesion" : "gland")} mask along the patient {AxisName} axis.";
    public override MeasureInputs Inputs => kind == MaskKind.Lesion ? MeasureInputs.LesionMask : MeasureInputs.GlandMask;
    public override ErrorScale ErrorScale => ErrorScale.Log;

    private string Suffix => axis switch { PatientAxis.LeftRight => "lr", PatientAxis.AnteroPosterior => "ap", _ => "cc" };
    private string AxisName => axis switch { PatientAxis.LeftRight => "left-right", PatientAxis.AnteroPosterior => "antero-posterior", _ => "cranio-caudal" };

    public override MeasureValue Measure(VisitContext context)
    {
        var mask = kind == MaskKind.Lesion ? context.LesionMask : context.GlandMask;
        if (!TryMask(mask, kind == MaskKind.Lesion ? "lesion" : "gland", out var m, out var skip)) return skip;
        var e = context.Cached($"extent:{kind}", () => new ExtentBox(MaskGrid.PatientExtentsMm(m)));
        double v = axis switch { PatientAxis.LeftRight => e.Mm.X, PatientAxis.AnteroPosterior => e.Mm.Y, _ => e.Mm.Z };
        return MeasureValue.Ok(this, v, Provenance(("grid", GridOf(m.Geometry))));
    }
}

/// <summary>Boxed extents for the per-visit cache.</summary>
internal sealed record ExtentBox(Serimetry.Engine.Core.Vec3 Mm);
