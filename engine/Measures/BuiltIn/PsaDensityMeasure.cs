using System.Globalization;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>
/// <c>psa.density</c>: serum PSA (ng/mL) / gland volume (mL) in ng/mL² (= ng/mL/cc)
/// (Src: facts.md §6; Hardman et al., Open J Urol 2011). The gland volume is
/// <see cref="VisitContext.GlandVolumeMlOverride"/> when set (e.g. Jacobian-derived), else the voxel-count
/// gland volume of the gland mask; the source is recorded in provenance because PSAD depends on the
/// volume method.
/// </summary>
public sealed class PsaDensityMeasure : BuiltInMeasure
{
    public override string Id => "psa.density";
    public override string Unit => "ng/mL2";
    public override string Description => "PSA density: serum PSA / gland volume.";
    public override MeasureInputs Inputs => MeasureInputs.Psa | MeasureInputs.GlandMask;
    public override ErrorScale ErrorScale => ErrorScale.Log;
    public override TrendScale TrendScale => TrendScale.Log;

    public override MeasureValue Measure(VisitContext context)
    {
        if (context.PsaNgPerMl is not double psa) return MeasureValue.NotApplicable(this, "no PSA value was given for this visit");
        if (!double.IsFinite(psa) || psa < 0)
            return MeasureValue.Failed(this, string.Create(CultureInfo.InvariantCulture, $"PSA {psa} ng/mL is not a finite non-negative number"));
        double volume;
        string source;
        if (context.GlandVolumeMlOverride is double given)
        {
            volume = given;
            source = "given gland volume";
        }
        else
        {
            var v = new MaskVolumeMeasure(MaskKind.Gland).Measure(context);
            if (v.Status != MeasureStatus.Ok) return MeasureValue.NotApplicable(this, v.Reason ?? "no gland volume");
            volume = v.Value!.Value;
            source = "gland mask voxel count";
        }
        if (!(volume > 0)) return MeasureValue.NotApplicable(this, "the gland volume is not positive");
        return MeasureValue.Ok(this, psa / volume, Provenance(("psaNgPerMl", psa), ("glandVolumeMl", volume), ("glandVolumeSource", source)));
    }
}
