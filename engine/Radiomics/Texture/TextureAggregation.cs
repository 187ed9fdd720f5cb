using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// The IBSI texture aggregation methods (IBSI reference manual 3.1.1). Directional families: 2D averaged
/// (BTW3), 2D slice-merged (SUJT), 2.5D direction-merged (JJUI), 2.5D merged (ZW7Z), 3D averaged (ITBB),
/// 3D merged (IAZD). Region families: 2D (8QNN), 2.5D (62GR), 3D (KOBO). "Merged" sums counts before a
/// feature is computed; "averaged" averages feature values. Slices are the z planes holding ROI voxels;
/// empty matrices are skipped.
/// </summary>
internal static class TextureAggregation
{
    private static readonly int[][] Directions2D = [[1, 0, 0], [0, 1, 0], [1, 1, 0], [1, -1, 0]];

    private static readonly int[][] Directions3D =
    [
        [1, 0, 0], [0, 1, 0], [0, 0, 1], [1, 1, 0], [1, -1, 0], [1, 0, 1], [1, 0, -1], [0, 1, 1], [0, 1, -1],
        [1, 1, 1], [1, 1, -1], [1, -1, 1], [1, -1, -1],
    ];

    public delegate void Emit(string aggregation, ReadOnlySpan<double> values);

    public static void RunDirectional(RoiData roi, IDirectionalMatrix f, IReadOnlyList<TextureDimension> dims, int distance, Emit emit)
    {
        int len = f.Length, nf = f.FeatureCount;
        var tmp = new double[len];
        var values = new double[nf];
        if (dims.Contains(TextureDimension.TwoD) || dims.Contains(TextureDimension.TwoPointFiveD))
        {
            var perDirection = new double[Directions2D.Length][];
            for (int d = 0; d < perDirection.Length; d++) perDirection[d] = new double[len];
            var slice = new double[len];
            var avg = new Mean(nf);
            var sliceAvg = new Mean(nf);
            foreach (int z in RoiSlices(roi))
            {
                Array.Clear(slice);
                for (int d = 0; d < Directions2D.Length; d++)
                {
                    Array.Clear(tmp);
                    var v = Directions2D[d];
                    f.Accumulate(z, v[0] * distance, v[1] * distance, 0, tmp);
                    if (IsEmpty(tmp)) continue;
                    f.Features(tmp, values); avg.Add(values);
                    AddTo(slice, tmp); AddTo(perDirection[d], tmp);
                }
                if (IsEmpty(slice)) continue;
                f.Features(slice, values); sliceAvg.Add(values);
            }
            var dirAvg = new Mean(nf);
            var all = new double[len];
            foreach (var m in perDirection)
            {
                if (IsEmpty(m)) continue;
                f.Features(m, values); dirAvg.Add(values);
                AddTo(all, m);
            }
            if (dims.Contains(TextureDimension.TwoD))
            {
                emit(IbsiAggregation.TwoDAveraged, avg.Result());
                emit(IbsiAggregation.TwoDSliceMerged, sliceAvg.Result());
            }
            if (dims.Contains(TextureDimension.TwoPointFiveD))
            {
                emit(IbsiAggregation.TwoPointFiveDDirectionMerged, dirAvg.Result());
                emit(IbsiAggregation.TwoPointFiveDMerged, FeaturesOrNaN(f, all, values));
            }
        }
        if (!dims.Contains(TextureDimension.ThreeD)) return;
        var avg3 = new Mean(nf);
        var merged = new double[len];
        foreach (var v in Directions3D)
        {
            Array.Clear(tmp);
            f.Accumulate(-1, v[0] * distance, v[1] * distance, v[2] * distance, tmp);
            if (IsEmpty(tmp)) continue;
            f.Features(tmp, values); avg3.Add(values);
            AddTo(merged, tmp);
        }
        emit(IbsiAggregation.ThreeDAveraged, avg3.Result());
        emit(IbsiAggregation.ThreeDMerged, FeaturesOrNaN(f, merged, values));
    }

    public static void RunRegion(RoiData roi, IRegionMatrix f, IReadOnlyList<TextureDimension> dims, Emit emit)
    {
        int len = f.Length, nf = f.FeatureCount;
        var values = new double[nf];
        if (dims.Contains(TextureDimension.TwoD) || dims.Contains(TextureDimension.TwoPointFiveD))
        {
            var tmp = new double[len];
            var merged = new double[len];
            double mergedCount = 0;
            var avg = new Mean(nf);
            foreach (int z in RoiSlices(roi))
            {
                Array.Clear(tmp);
                double count = f.Accumulate(z, tmp);
                if (count == 0) continue;
                f.Features(tmp, count, values); avg.Add(values);
                AddTo(merged, tmp); mergedCount += count;
            }
            if (dims.Contains(TextureDimension.TwoD)) emit(IbsiAggregation.TwoD, avg.Result());
            if (dims.Contains(TextureDimension.TwoPointFiveD))
            {
                f.Features(merged, mergedCount, values);
                emit(IbsiAggregation.TwoPointFiveD, values);
            }
        }
        if (!dims.Contains(TextureDimension.ThreeD)) return;
        var volume = new double[len];
        double n = f.Accumulate(-1, volume);
        f.Features(volume, n, values);
        emit(IbsiAggregation.ThreeD, values);
    }

    /// <summary>The z indices of slices that contain intensity-mask voxels.</summary>
    public static List<int> RoiSlices(RoiData roi)
    {
        var slices = new List<int>();
        int plane = roi.Nx * roi.Ny;
        for (int z = 0; z < roi.Nz; z++)
            if (roi.InRoi.AsSpan(z * plane, plane).Contains((byte)1)) slices.Add(z);
        return slices;
    }

    private static double[] FeaturesOrNaN(IDirectionalMatrix f, double[] m, double[] values)
    {
        if (IsEmpty(m)) Array.Fill(values, double.NaN);
        else f.Features(m, values);
        return values;
    }

    private static bool IsEmpty(double[] m)
    {
        foreach (var c in m) if (c != 0) return false;
        return true;
    }

    private static void AddTo(double[] target, double[] source)
    {
        for (int n = 0; n < target.Length; n++) target[n] += source[n];
    }

    /// <summary>Running mean of feature vectors; NaN when nothing was added.</summary>
    private sealed class Mean(int n)
    {
        private readonly double[] _sum = new double[n];
        private int _count;

        public void Add(ReadOnlySpan<double> v)
        {
            for (int i = 0; i < _sum.Length; i++) _sum[i] += v[i];
            _count++;
        }

        public double[] Result()
        {
            var r = new double[_sum.Length];
            for (int i = 0; i < r.Length; i++) r[i] = _count > 0 ? _sum[i] / _count : double.NaN;
            return r;
        }
    }
}
