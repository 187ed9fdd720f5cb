using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>
/// <c>lesion.volume.ellipsoid</c> / <c>gland.volume.ellipsoid</c>: the PI-RADS ellipsoid estimate
/// V = π/6 · AP · LR · CC (mL), with the three diameters taken as the mask's extents along the patient
/// axes (Src: PI-RADS v2.1, Turkbey et al., Eur Urol 2019; facts.md §4). PI-RADS readers take the
/// maxima on mid-sagittal and axial slices; extents of the whole 3D mask are the automated equivalent.
/// </summary>
public sealed class EllipsoidVolumeMeasure(MaskKind kind) : BuiltInMeasure
{
    public override string Id => kind == MaskKind.Lesion ? "lesion.volume.ellipsoid" : "gland.volume.ellipsoid";
    public override string Unit => "mL";
    public override string Description => "PI-RADS ellipsoid volume π/6·AP·LR·CC from patient-axis extents.";
    public override MeasureInputs Inputs => kind == MaskKind.Lesion ? MeasureInputs.LesionMask : MeasureInputs.GlandMask;
    public override ErrorScale ErrorScale => ErrorScale.Log;
    public override TrendScale TrendScale => TrendScale.Log;

    public override MeasureValue Measure(VisitContext context)
    {
        var mask = kind == MaskKind.Lesion ? context.LesionMask : context.GlandMask;
        if (!TryMask(mask, kind == MaskKind.Lesion ? "lesion" : "gland", out var m, out var skip)) return skip;
        var e = context.Cached($"extent:{kind}", () => new ExtentBox(MaskGrid.PatientExtentsMm(m))).Mm;
        double ml = Math.PI / 6 * e.X * e.Y * e.Z / 1000.0;
        return MeasureValue.Ok(this, ml, Provenance(("lrMm", e.X), ("apMm", e.Y), ("ccMm", e.Z), ("grid", GridOf(m.Geometry))));
    }
}
