using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// GLSZM (IBSI 3.8, family 9SAK: zones counted by grey level and size) or GLDZM (IBSI 3.9, family VMDZ:
/// zones counted by grey level and distance to the ROI border). N_v is the number of voxels covered.
/// </summary>
internal sealed class ZoneMatrix : IRegionMatrix
{
    private readonly RoiData _roi;
    private readonly Zones _zones;
    private readonly bool _byDistance;
    private readonly int _nj;
    private readonly double[] _values = new double[CountMatrixFeatures.Count];
    private readonly int[] _column;
    private readonly double[] _jValues;

    public ZoneMatrix(RoiData roi, Zones zones, bool byDistance)
    {
        _roi = roi;
        _zones = zones;
        _byDistance = byDistance;
        if (byDistance)
        {
            int max = 1;
            for (int n = 0; n < roi.Count; n++)
                if (roi.InRoi[n] != 0) max = Math.Max(max, Math.Max(zones.Distance2D[n], zones.Distance3D[n]));
            _nj = max;
            _column = [];
            _jValues = [];
            return;
        }
        // Zone sizes can reach the ROI size, so the size axis keeps only the sizes that occur (2D and 3D).
        var sizes = new SortedSet<int>();
        zones.ForEach(-1, (_, size, _) => sizes.Add(size));
        foreach (int z in TextureAggregation.RoiSlices(roi)) zones.ForEach(z, (_, size, _) => sizes.Add(size));
        _column = new int[sizes.Max + 1];
        _jValues = new double[sizes.Count];
        int c = 0;
        foreach (int size in sizes) { _column[size] = c; _jValues[c] = size; c++; }
        _nj = sizes.Count;
    }

    public int Length => _roi.BinCount * _nj;
    public int FeatureCount => 16;

    public double Accumulate(int slice, double[] m)
    {
        double voxels = 0;
        _zones.ForEach(slice, (level, size, distance) =>
        {
            int column = _byDistance ? distance - 1 : _column[size];
            m[(level - 1) * _nj + column]++;
            voxels += size;
        });
        return voxels;
    }

    public void Features(double[] m, double voxelCount, Span<double> result)
    {
        CountMatrixFeatures.Compute(m, _roi.BinCount, _nj, voxelCount, _values, _jValues);
        _values.AsSpan(0, 16).CopyTo(result);
    }
}
