namespace Serimetry.Engine.Measures;

/// <summary>What a measure needs from a visit. A measure whose inputs are missing returns
/// <see cref="MeasureStatus.NotApplicable"/> with the missing input named.</summary>
[Flags]
public enum MeasureInputs
{
    None = 0,
    T2w = 1,
    Adc = 2,
    GlandMask = 4,
    LesionMask = 8,
    Psa = 16,
}
