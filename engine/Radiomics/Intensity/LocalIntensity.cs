using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Intensity;

/// <summary>
/// Local intensity features (IBSI 3.2, family 9ST6): the mean intensity in a 1 cm³ sphere centred on a
/// voxel (all image voxels whose centres lie within the sphere count, ROI or not). Local peak: the
/// sphere around the ROI's maximum-intensity voxel(s), highest mean if several; global peak: the highest
/// such mean over all ROI voxels. Non-finite intensities in a sphere are skipped.
/// </summary>
internal static class LocalIntensity
{
    public static void Compute(RoiData roi, FeatureSink sink)
    {
        var (dx, dy, dz) = SphereOffsets(roi);
        double max = double.NegativeInfinity;
        for (int n = 0; n < roi.Count; n++)
            if (roi.InRoi[n] != 0 && roi.Intensity[n] > max) max = roi.Intensity[n];
        double local = double.NegativeInfinity, global = double.NegativeInfinity;
        for (int z = 0, n = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, n++)
        {
            if (roi.InRoi[n] == 0) continue;
            double mean = SphereMean(roi, x, y, z, dx, dy, dz);
            if (mean > global) global = mean;
            if (roi.Intensity[n] == max && mean > local) local = mean;
        }
        sink.Add(FamilyNames.LocalIntensity, "Local intensity peak", "VJGA", IbsiAggregation.Volume3D, local);
        sink.Add(FamilyNames.LocalIntensity, "Global intensity peak", "0F91", IbsiAggregation.Volume3D, global);
    }

    private static (int[] Dx, int[] Dy, int[] Dz) SphereOffsets(RoiData roi)
    {
        double r = RoiPreparer.PeakRadiusMm;
        var s = roi.SpacingMm;
        int mx = (int)Math.Ceiling(r / s.X), my = (int)Math.Ceiling(r / s.Y), mz = (int)Math.Ceiling(r / s.Z);
        List<int> dx = [], dy = [], dz = [];
        for (int k = -mz; k <= mz; k++)
        for (int j = -my; j <= my; j++)
        for (int i = -mx; i <= mx; i++)
        {
            double px = i * s.X, py = j * s.Y, pz = k * s.Z;
            if (px * px + py * py + pz * pz > r * r) continue;
            dx.Add(i); dy.Add(j); dz.Add(k);
        }
        return ([.. dx], [.. dy], [.. dz]);
    }

    private static double SphereMean(RoiData roi, int x, int y, int z, int[] dx, int[] dy, int[] dz)
    {
        double sum = 0; int count = 0;
        for (int o = 0; o < dx.Length; o++)
        {
            int xx = x + dx[o], yy = y + dy[o], zz = z + dz[o];
            if ((uint)xx >= (uint)roi.Nx || (uint)yy >= (uint)roi.Ny || (uint)zz >= (uint)roi.Nz) continue;
            double v = roi.Intensity[roi.Index(xx, yy, zz)];
            if (!double.IsFinite(v)) continue;
            sum += v; count++;
        }
        return sum / count;
    }
}
