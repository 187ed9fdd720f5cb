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

    public ZoneMatrix(RoiData roi, Zones zones, bool byDistance)
    {
        _roi = roi;
        _zones = zones;
        _byDistance = byDistance;
        int max = 1;
        if (byDistance)
        {
            for (int n = 0; n < roi.Count; n++)
                if (roi.InRoi[n] != 0) max = Math.Max(max, Math.Max(zones.Distance2D[n], zones.Distance3D[n]));
        }
        else
        {
            // 2D zones lie inside 3D zones, so the largest 3D zone bounds every size.
            zones.ForEach(-1, (_, size, _) => max = Math.Max(max, size));
        }
        _nj = max;
    }

    public int Length => _roi.BinCount * _nj;
    public int FeatureCount => 16;

    public double Accumulate(int slice, double[] m)
    {
        double voxels = 0;
        _zones.ForEach(slice, (level, size, distance) =>
        {
            int j = _byDistance ? distance : size;
            m[(level - 1) * _nj + j - 1]++;
            voxels += size;
        });
        return voxels;
    }

    public void Features(double[] m, double voxelCount, Span<double> result)
    {
        CountMatrixFeatures.Compute(m, _roi.BinCount, _nj, voxelCount, _values);
        _values.AsSpan(0, 16).CopyTo(result);
    }
}
