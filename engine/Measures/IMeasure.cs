using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures;

/// <summary>
/// The measure plugin contract. An implementation describes itself (stable dotted id, unit, IBSI code,
/// inputs, error model) and measures one visit. Implementations must be stateless and thread-safe; the
/// registry creates one instance and calls it for every visit. See docs/measures.md.
/// </summary>
public interface IMeasure
{
    /// <summary>Dotted, stable id, e.g. <c>lesion.adc.median</c>. Never reuse an id for another definition.</summary>
    string Id { get; }

    /// <summary>Unit of the value (UCUM-like text, e.g. <c>mL</c>, <c>mm</c>, <c>10^-6 mm2/s</c>, <c>1</c>).</summary>
    string Unit { get; }

    /// <summary>One-sentence definition.</summary>
    string Description { get; }

    /// <summary>IBSI feature code where one exists (Src: IBSI reference manual, Zwanenburg et al. 2020), else null.</summary>
    string? IbsiCode => null;

    /// <summary>Images, masks and clinical values the measure needs.</summary>
    MeasureInputs Inputs { get; }

    /// <summary>How measurement error behaves for this measure: absolute (wSD) or proportional (wCV, log scale).</summary>
    ErrorScale ErrorScale { get; }

    /// <summary>Id of the repeatability-profile entry that applies; by default the measure's own id.</summary>
    string RepeatabilityId => Id;

    /// <summary>Scale for trend fits over visits.</summary>
    TrendScale TrendScale => TrendScale.Linear;

    /// <summary>Measures one visit. Must not throw for missing or empty inputs: return a status instead.</summary>
    MeasureValue Measure(VisitContext context);
}
