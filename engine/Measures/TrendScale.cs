namespace Serimetry.Engine.Measures;

/// <summary>Scale on which trends over visits are fitted: linear, or natural log (growth measures,
/// where a slope is a specific growth rate and gives a doubling time; Src: Schwartz 1961, Mehrara 2007).</summary>
public enum TrendScale
{
    Linear,
    Log,
}
