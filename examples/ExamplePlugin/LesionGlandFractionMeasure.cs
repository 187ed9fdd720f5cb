using Serimetry.Engine.Measures;
using Serimetry.Engine.Measures.BuiltIn;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Examples.Plugin;

/// <summary>
/// Example plugin measure: the fraction of the gland volume taken by the lesion (lesion volume / gland
/// volume, both by voxel counting). Public, non-abstract and with a parameterless constructor, so
/// <see cref="MeasureRegistry.LoadPlugins"/> finds it. It reuses the built-in volume measures, and returns
/// NotApplicable (never throws) when an input is missing.
/// </summary>
public sealed class LesionGlandFractionMeasure : IMeasure
{
    private static readonly IMeasure LesionVolume = new MaskVolumeMeasure(MaskKind.Lesion);
    private static readonly IMeasure GlandVolume = new MaskVolumeMeasure(MaskKind.Gland);

    /// <inheritdoc />
    public string Id => "example.lesion.gland-fraction";

    /// <inheritdoc />
    public string Unit => "1";

    /// <inheritdoc />
    public string Description => "Lesion volume divided by gland volume (voxel counting).";

    /// <inheritdoc />
    public MeasureInputs Inputs => MeasureInputs.LesionMask | MeasureInputs.GlandMask;

    /// <inheritdoc />
    public ErrorScale ErrorScale => ErrorScale.Log;

    /// <inheritdoc />
    public MeasureValue Measure(VisitContext context)
    {
        var lesion = LesionVolume.Measure(context);
        if (lesion.Status != MeasureStatus.Ok) return MeasureValue.NotApplicable(this, lesion.Reason ?? "no lesion volume");
        var gland = GlandVolume.Measure(context);
        if (gland.Status != MeasureStatus.Ok) return MeasureValue.NotApplicable(this, gland.Reason ?? "no gland volume");
        return MeasureValue.Ok(this, lesion.Value!.Value / gland.Value!.Value,
            new Dictionary<string, string> { ["lesionMl"] = $"{lesion.Value}", ["glandMl"] = $"{gland.Value}" });
    }
}
