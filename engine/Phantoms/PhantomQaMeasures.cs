using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// The simple measures the phantom QA run repeats (docs/qa.md; they stand in for the full measurement
/// pipeline so the engine's noise floor can be measured without registration):
/// <list type="bullet">
/// <item><c>lesion.adc.mean</c>, <c>lesion.adc.median</c>, <c>lesion.adc.p10</c>: ADC-map voxels whose centre falls
/// (nearest neighbour) in a lesion-mask voxel; percentiles by linear interpolation between order statistics.</item>
/// <item><c>lesion.volume</c>: the lesion outline re-fitted on the T2w image: voxels of the lesion mask dilated by one
/// voxel in-plane whose T2 signal is below the midpoint of the mean inside the mask and the mean of the
/// surrounding peripheral-zone ring.</item>
/// <item><c>lesion.conspicuity.t2w</c>: mean T2 of that ring / mean T2 inside the mask.</item>
/// </list>
/// </summary>
internal static class PhantomQaMeasures
{
    internal static IReadOnlyList<(string Measure, double Value)> Measure(PhantomVisit v)
    {
        var adc = LesionAdcValues(v.Adc, v.LesionMask);
        if (adc.Length == 0) throw new InvalidParameterException("the lesion covers no ADC voxel", "phantom spec", "increase lesionRadiusMm");
        Array.Sort(adc);
        var (volumeMl, ratio) = RefitLesion(v);
        return
        [
            ("lesion.adc.mean", adc.Average()),
            ("lesion.adc.median", Percentile(adc, 50)),
            ("lesion.adc.p10", Percentile(adc, 10)),
            ("lesion.volume", volumeMl),
            ("lesion.conspicuity.t2w", ratio),
        ];
    }

    /// <summary>Percentile of sorted data, linear interpolation between order statistics at rank p/100·(n−1).</summary>
    internal static double Percentile(double[] sorted, double p)
    {
        double rank = p / 100 * (sorted.Length - 1);
        int lo = (int)Math.Floor(rank);
        int hi = Math.Min(lo + 1, sorted.Length - 1);
        return sorted[lo] + (rank - lo) * (sorted[hi] - sorted[lo]);
    }

    private static double[] LesionAdcValues(Volume<float> adc, Volume<byte> lesion)
    {
        var values = new List<double>();
        var g = adc.Geometry;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    var c = lesion.Geometry.PhysicalToIndex(g.IndexToPhysical(i, j, k));
                    int li = (int)Math.Round(c.X), lj = (int)Math.Round(c.Y), lk = (int)Math.Round(c.Z);
                    if (li < 0 || lj < 0 || lk < 0 || li >= lesion.Size.X || lj >= lesion.Size.Y || lk >= lesion.Size.Z) continue;
                    if (lesion[li, lj, lk] != 0) values.Add(adc[i, j, k]);
                }
        return [.. values];
    }

    private static (double VolumeMl, double Ratio) RefitLesion(PhantomVisit v)
    {
        var size = v.T2w.Size;
        var candidate = new bool[v.T2w.Voxels.Length];
        double inside = 0, ring = 0;
        long nIn = 0, nRing = 0;
        for (int k = 0; k < size.Z; k++)
            for (int j = 0; j < size.Y; j++)
                for (int i = 0; i < size.X; i++)
                {
                    int idx = v.T2w.LinearIndex(i, j, k);
                    if (v.LesionMask.Voxels[idx] != 0) { candidate[idx] = true; inside += v.T2w.Voxels[idx]; nIn++; continue; }
                    if (!NearLesion(v.LesionMask, i, j, k, 1)) continue;
                    candidate[idx] = true;
                    if (v.ZoneMask.Voxels[idx] == 1) { ring += v.T2w.Voxels[idx]; nRing++; }
                }
        if (nIn == 0 || nRing == 0) throw new InvalidParameterException("the lesion mask is empty or has no peripheral-zone ring", "phantom QA");
        double muIn = inside / nIn, muRing = ring / nRing, threshold = (muIn + muRing) / 2;
        long count = 0;
        for (int idx = 0; idx < candidate.Length; idx++) if (candidate[idx] && v.T2w.Voxels[idx] < threshold) count++;
        return (count * v.T2w.Geometry.VoxelVolumeMm3 / 1000, muRing / muIn);
    }

    private static bool NearLesion(Volume<byte> mask, int i, int j, int k, int r)
    {
        for (int dj = -r; dj <= r; dj++)
            for (int di = -r; di <= r; di++)
            {
                int x = i + di, y = j + dj;
                if (x >= 0 && y >= 0 && x < mask.Size.X && y < mask.Size.Y && mask[x, y, k] != 0) return true;
            }
        return false;
    }
}
