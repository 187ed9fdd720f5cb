using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Intensity;

/// <summary>
/// Local intensity features (IBSI 3.2, family 9ST6): the mean intensity in a 1 cm³ sphere centred on a
/// voxel (all image voxels whose centres lie within the sphere count, ROI or not). Local peak: the
/// sphere around the ROI's maximum-intensity voxel(s), highest mean if several; global peak: the highest
/// such mean over all ROI voxels. Non-finite intensities in a sphere are skipped. The sphere is summed as x-runs
/// over prefix sums, so the cost per ROI voxel is the number of runs, not the number of sphere voxels.
/// </summary>
internal static class LocalIntensity
{
    public static void Compute(RoiData roi, FeatureSink sink)
    {
        var rows = SphereRows(roi);
        var (sum, count) = RowPrefixSums(roi);
        double max = double.NegativeInfinity;
        for (int n = 0; n < roi.Count; n++)
            if (roi.InRoi[n] != 0 && roi.Intensity[n] > max) max = roi.Intensity[n];
        double local = double.NegativeInfinity, global = double.NegativeInfinity;
        for (int z = 0, n = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, n++)
        {
            if (roi.InRoi[n] == 0) continue;
            double mean = SphereMean(roi, x, y, z, rows, sum, count);
            if (mean > global) global = mean;
            if (roi.Intensity[n] == max && mean > local) local = mean;
        }
        sink.Add(FamilyNames.LocalIntensity, "Local intensity peak", "VJGA", IbsiAggregation.None, local);
        sink.Add(FamilyNames.LocalIntensity, "Global intensity peak", "0F91", IbsiAggregation.None, global);
    }

    /// <summary>The sphere as x-runs: for each (dy, dz) offset, the half-width in x of voxel centres inside it.</summary>
    private static (int Dy, int Dz, int HalfWidth)[] SphereRows(RoiData roi)
    {
        double r = RoiPreparer.PeakRadiusMm;
        var s = roi.SpacingMm;
        int my = (int)Math.Ceiling(r / s.Y), mz = (int)Math.Ceiling(r / s.Z);
        var rows = new List<(int, int, int)>();
        for (int k = -mz; k <= mz; k++)
        for (int j = -my; j <= my; j++)
        {
            double rest = r * r - (j * s.Y) * (j * s.Y) - (k * s.Z) * (k * s.Z);
            if (rest < 0) continue;
            int w = (int)Math.Floor(Math.Sqrt(rest) / s.X + 1e-9);
            while ((w + 1) * s.X * (w + 1) * s.X <= rest) w++;
            while (w > 0 && w * s.X * w * s.X > rest) w--;
            rows.Add((j, k, w));
        }
        return [.. rows];
    }

    // Prefix sums along x of the finite intensities and their count; row r of length Nx+1 starts at r·(Nx+1).
    private static (double[] Sum, int[] Count) RowPrefixSums(RoiData roi)
    {
        int stride = roi.Nx + 1, rowCount = roi.Ny * roi.Nz;
        var sum = new double[stride * rowCount];
        var count = new int[stride * rowCount];
        for (int row = 0; row < rowCount; row++)
        {
            int src = row * roi.Nx, dst = row * stride;
            for (int x = 0; x < roi.Nx; x++)
            {
                double v = roi.Intensity[src + x];
                bool ok = double.IsFinite(v);
                sum[dst + x + 1] = sum[dst + x] + (ok ? v : 0);
                count[dst + x + 1] = count[dst + x] + (ok ? 1 : 0);
            }
        }
        return (sum, count);
    }

    private static double SphereMean(RoiData roi, int x, int y, int z, (int Dy, int Dz, int HalfWidth)[] rows, double[] sum, int[] count)
    {
        int stride = roi.Nx + 1;
        double total = 0; int n = 0;
        foreach (var (dy, dz, w) in rows)
        {
            int yy = y + dy, zz = z + dz;
            if ((uint)yy >= (uint)roi.Ny || (uint)zz >= (uint)roi.Nz) continue;
            int x0 = Math.Max(0, x - w), x1 = Math.Min(roi.Nx, x + w + 1);
            int row = (yy + roi.Ny * zz) * stride;
            total += sum[row + x1] - sum[row + x0];
            n += count[row + x1] - count[row + x0];
        }
        return total / n;
    }
}
