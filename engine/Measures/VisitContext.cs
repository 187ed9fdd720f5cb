using System.Collections.Concurrent;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Measures;

/// <summary>
/// Everything a measure may read for one visit. Images keep their own grids: the ADC map is on its own
/// grid; masks may be on the T2w grid or any other grid, and measures resample them through physical
/// space (nearest neighbour, docs/measures.md) when they need them on an intensity grid. A mask voxel is
/// inside when its label is non-zero.
/// </summary>
public sealed class VisitContext
{
    private readonly ConcurrentDictionary<string, object> _cache = new();

    public VisitContext(int visitIndex, DateOnly date, Volume<float> t2w)
    {
        ArgumentNullException.ThrowIfNull(t2w);
        VisitIndex = visitIndex;
        Date = date;
        T2w = t2w;
    }

    /// <summary>0 for the baseline, then 1, 2 … in date order.</summary>
    public int VisitIndex { get; }

    /// <summary>Date of the exam.</summary>
    public DateOnly Date { get; }

    /// <summary>T2-weighted volume (arbitrary units).</summary>
    public Volume<float> T2w { get; }

    /// <summary>ADC map in 10^-6 mm²/s on its own grid, or null.</summary>
    public Volume<float>? Adc { get; init; }

    /// <summary>Whole-gland mask, or null.</summary>
    public Volume<byte>? GlandMask { get; init; }

    /// <summary>Lesion mask (any non-zero label), or null.</summary>
    public Volume<byte>? LesionMask { get; init; }

    /// <summary>
    /// Partial-volume occupancy of the lesion (fraction 0-1 of each voxel), on <see cref="LesionMask"/>'s grid, or
    /// null: <c>lesion.volume</c> then sums it instead of counting voxels, and the lesion ADC samples weigh which ADC
    /// voxels the lesion fills (docs/measures.md).
    /// </summary>
    public Volume<float>? LesionOccupancy { get; init; }

    /// <summary>Serum PSA in ng/mL for this visit, or null.</summary>
    public double? PsaNgPerMl { get; init; }

    /// <summary>
    /// Gland volume in mL from another source (e.g. the Jacobian of a deformable alignment) used by
    /// <c>psa.density</c> instead of the gland mask when set.
    /// </summary>
    public double? GlandVolumeMlOverride { get; init; }

    /// <summary>Further per-visit numbers for plugins (free keys).</summary>
    public IReadOnlyDictionary<string, double> Extra { get; init; } = new Dictionary<string, double>();

    /// <summary>Parameters of the built-in measures.</summary>
    public MeasureSettings Settings { get; init; } = MeasureSettings.Default;

    /// <summary>Per-visit cache of derived data (resampled masks, samples) shared by measures.</summary>
    internal T Cached<T>(string key, Func<T> create) where T : class => (T)_cache.GetOrAdd(key, _ => create());
}
