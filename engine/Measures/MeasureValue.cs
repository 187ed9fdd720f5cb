namespace Serimetry.Engine.Measures;

/// <summary>
/// One measured value with unit, status and provenance (how it was obtained: grid, voxel counts,
/// parameters). <see cref="Value"/> is null unless <see cref="Status"/> is <see cref="MeasureStatus.Ok"/>.
/// </summary>
public sealed record MeasureValue(
    string MeasureId,
    double? Value,
    string Unit,
    MeasureStatus Status,
    string? Reason,
    IReadOnlyDictionary<string, string> Provenance)
{
    private static readonly IReadOnlyDictionary<string, string> NoProvenance = new Dictionary<string, string>();

    /// <summary>A measured value; a non-finite value becomes <see cref="MeasureStatus.Failed"/> (NaN policy, docs/measures.md).</summary>
    public static MeasureValue Ok(IMeasure measure, double value, IReadOnlyDictionary<string, string>? provenance = null) =>
        double.IsFinite(value)
            ? new(measure.Id, value, measure.Unit, MeasureStatus.Ok, null, provenance ?? NoProvenance)
            : Failed(measure, $"the computation gave a non-finite value ({value})", provenance);

    /// <summary>The measure does not apply (missing input, empty mask).</summary>
    public static MeasureValue NotApplicable(IMeasure measure, string reason, IReadOnlyDictionary<string, string>? provenance = null) =>
        new(measure.Id, null, measure.Unit, MeasureStatus.NotApplicable, reason, provenance ?? NoProvenance);

    /// <summary>The measurement failed.</summary>
    public static MeasureValue Failed(IMeasure measure, string reason, IReadOnlyDictionary<string, string>? provenance = null) =>
        new(measure.Id, null, measure.Unit, MeasureStatus.Failed, reason, provenance ?? NoProvenance);
}
