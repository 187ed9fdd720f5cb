namespace Serimetry.Engine.Measures;

/// <summary>
/// Runs measures on one visit. A measure that throws becomes a <see cref="MeasureStatus.Failed"/> value
/// with the error message (so one broken plugin cannot sink a comparison; the report is then partial).
/// </summary>
public static class MeasureRunner
{
    /// <summary>Values keyed by measure id, in the measures' order.</summary>
    public static IReadOnlyDictionary<string, MeasureValue> Run(IEnumerable<IMeasure> measures, VisitContext context)
    {
        var result = new Dictionary<string, MeasureValue>();
        foreach (var m in measures)
            result[m.Id] = RunOne(m, context);
        return result;
    }

    /// <summary>One measure, with exceptions turned into a failed value.</summary>
    public static MeasureValue RunOne(IMeasure measure, VisitContext context)
    {
        try
        {
            var v = measure.Measure(context);
            if (v.Status == MeasureStatus.Ok && (v.Value is not double d || !double.IsFinite(d)))
                return MeasureValue.Failed(measure, "the measure returned status ok without a finite value");
            return v;
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            return MeasureValue.Failed(measure, $"{ex.GetType().Name}: {ex.Message}");
        }
    }
}
