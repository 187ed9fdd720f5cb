namespace Serimetry.Engine.Measures;

/// <summary>Parameters of the built-in measures; recorded in every report so results can be repeated.</summary>
/// <param name="ShellDistanceMm">Width of the peri-lesional shell used by the conspicuity measures: gland
/// voxels outside the lesion whose centre lies within this distance of a lesion voxel centre (docs/measures.md).</param>
/// <param name="MaxBoundaryPointsForDiameter">Safety limit on boundary voxels for the exact all-pairs largest
/// diameter; above it the measure fails with a clear reason instead of running for minutes.</param>
/// <param name="AdcMinLesionFraction">An ADC voxel is a lesion sample when the lesion (its partial-volume occupancy,
/// or the binary mask) fills at least this fraction of it, judged on the finer mask grid (docs/measures.md).</param>
public sealed record MeasureSettings(double ShellDistanceMm = 5.0, int MaxBoundaryPointsForDiameter = 60_000, double AdcMinLesionFraction = 0.75)
{
    /// <summary>The defaults documented in docs/measures.md.</summary>
    public static MeasureSettings Default { get; } = new();
}
