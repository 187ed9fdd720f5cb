using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>Shared plumbing of the built-in measures: input checks that turn a missing or empty input into
/// <see cref="MeasureStatus.NotApplicable"/> with a reason (empty-mask policy, docs/measures.md).</summary>
public abstract class BuiltInMeasure : IMeasure
{
    public abstract string Id { get; }
    public abstract string Unit { get; }
    public abstract string Description { get; }
    public virtual string? IbsiCode => null;
    public abstract MeasureInputs Inputs { get; }
    public abstract ErrorScale ErrorScale { get; }
    public virtual string RepeatabilityId => Id;
    public virtual TrendScale TrendScale => TrendScale.Linear;

    public abstract MeasureValue Measure(VisitContext context);

    /// <summary>The named mask when present and non-empty; otherwise a NotApplicable value in <paramref name="skip"/>.</summary>
    protected bool TryMask(Volume<byte>? mask, string name, out Volume<byte> result, out MeasureValue skip)
    {
        result = mask!;
        skip = null!;
        if (mask is null)
        {
            skip = MeasureValue.NotApplicable(this, $"no {name} mask was given for this visit");
            return false;
        }
        if (MaskGrid.Count(mask.Voxels) == 0)
        {
            skip = MeasureValue.NotApplicable(this, $"the {name} mask is empty");
            return false;
        }
        return true;
    }

    /// <summary>Provenance dictionary from key/value pairs formatted with the invariant culture.</summary>
    protected static Dictionary<string, string> Provenance(params (string Key, object Value)[] items)
    {
        var d = new Dictionary<string, string>(items.Length);
        foreach (var (key, value) in items)
            d[key] = Convert.ToString(value, CultureInfo.InvariantCulture) ?? "";
        return d;
    }

    /// <summary>Short description of a grid for provenance (no identifiers).</summary>
    protected static string GridOf(Geometry g) => string.Create(CultureInfo.InvariantCulture,
        $"{g.Size} @ {g.SpacingMm.X:0.###}x{g.SpacingMm.Y:0.###}x{g.SpacingMm.Z:0.###} mm");
}

/// <summary>Which mask a geometric measure reads.</summary>
public enum MaskKind
{
    Lesion,
    Gland,
}
