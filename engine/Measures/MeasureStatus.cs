namespace Serimetry.Engine.Measures;

/// <summary>Outcome of one measurement.</summary>
public enum MeasureStatus
{
    /// <summary>A finite value was measured.</summary>
    Ok,

    /// <summary>The measure does not apply to this visit (missing input, empty mask); not an error.</summary>
    NotApplicable,

    /// <summary>The measurement was attempted and failed; the report is then marked partial.</summary>
    Failed,
}
