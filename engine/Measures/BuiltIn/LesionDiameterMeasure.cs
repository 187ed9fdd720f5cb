using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>
/// <c>lesion.diameter.max</c>: the largest 3D distance (mm) between centres of lesion boundary voxels
/// (mask voxels with a face neighbour outside the mask), exact over all pairs. Voxel centres lie up to
/// half a voxel inside the true outline, so the value is biased low by up to about one voxel.
/// Related IBSI feature: maximum 3D diameter L0JK (which uses mesh vertices instead).
/// </summary>
public sealed class LesionDiameterMeasure : BuiltInMeasure
{
    public override string Id => "lesion.diameter.max";
    public override string Unit => "mm";
    public override string Description => "Largest 3D distance between lesion boundary voxel centres.";
    public override string? IbsiCode => "L0JK";
    public override MeasureInputs Inputs => MeasureInputs.LesionMask;
    public override ErrorScale ErrorScale => ErrorScale.Log;

    public override MeasureValue Measure(VisitContext context)
    {
        if (!TryMask(context.LesionMask, "lesion", out var m, out var skip)) return skip;
        var points = MaskGrid.BoundaryCentres(m);
        if (points.Count > context.Settings.MaxBoundaryPointsForDiameter)
            return MeasureValue.Failed(this, $"the lesion outline has {points.Count} boundary voxels, above the limit of " +
                $"{context.Settings.MaxBoundaryPointsForDiameter}; check that the lesion mask is a lesion and not a gland");
        double d = MaxPairDistance(points);
        return MeasureValue.Ok(this, d, Provenance(("boundaryVoxels", points.Count), ("grid", GridOf(m.Geometry))));
    }

    /// <summary>Largest distance over all pairs; per-partition maxima merged, so the result does not depend on threads.</summary>
    internal static double MaxPairDistance(List<Vec3> points)
    {
        var p = points.ToArray();
        int parts = ParallelRange.PartitionCount(p.Length, 256);
        var best = new double[Math.Max(parts, 1)];
        ParallelRange.For(p.Length, 256, (part, start, end) =>
        {
            double m2 = 0;
            for (int a = start; a < end; a++)
                for (int b = a + 1; b < p.Length; b++)
                {
                    double dx = p[a].X - p[b].X, dy = p[a].Y - p[b].Y, dz = p[a].Z - p[b].Z;
                    double d2 = dx * dx + dy * dy + dz * dz;
                    if (d2 > m2) m2 = d2;
                }
            best[part] = m2;
        });
        return Math.Sqrt(best.Max());
    }
}
