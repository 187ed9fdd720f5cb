using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;

namespace Serimetry.Engine.Radiomics.Preparation;

/// <summary>
/// Runs the IBSI chapter 2 processing chain: grid check, optional resampling (image and mask, mask
/// re-binarised at the partial-volume threshold), crop, non-finite policy, re-segmentation and
/// discretisation. The morphological mask is the (resampled) ROI; the intensity mask is it after re-segmentation.
/// </summary>
internal static class RoiPreparer
{
    /// <summary>Most grey levels for the texture discretisation: a GLCM holds N_g² counts per matrix.</summary>
    public const int MaxTextureBins = 1024;

    /// <summary>Radius of the 1 cm³ sphere used by the local-intensity features (IBSI 3.2): (3/(4π))^(1/3) cm.</summary>
    public static readonly double PeakRadiusMm = 10.0 * Math.Cbrt(3.0 / (4.0 * Math.PI));

    public static RoiData Prepare(Volume<float> image, Volume<byte> mask, RadiomicsSettings settings)
    {
        ArgumentNullException.ThrowIfNull(image);
        ArgumentNullException.ThrowIfNull(mask);
        ArgumentNullException.ThrowIfNull(settings);
        image.Geometry.RequireCongruent(mask.Geometry, "radiomics image and mask");

        if (settings.Resampling is not { } rs)
        {
            // Native grid: only the ROI's bounding box (plus margin) is converted.
            var voxels = image.Voxels;
            var labels = mask.Voxels;
            return Crop(image.Geometry, n => voxels[n], n => labels[n] != 0, settings);
        }
        RequireNonEmpty(mask.Voxels, "mask", "the mask has no voxel inside the ROI (all zero)");
        var (values, roi) = Resample(image, mask, rs);
        RequireNonEmpty(roi.Voxels, "mask", "the ROI vanished after resampling (fewer than half-covered voxels)");
        var v = values.Voxels;
        var r = roi.Voxels;
        return Crop(values.Geometry, n => v[n], n => r[n] != 0, settings);
    }

    /// <summary>
    /// Image and ROI on the IBSI "align grid centres" grid (<see cref="ResampleGrid.WithSpacing"/>) through the engine's
    /// one resampler (<see cref="Resampler"/>); the ROI's 0/1 indicator is interpolated and kept at the partial-volume
    /// threshold. IBSI's grid never places a centre outside the old grid's extent, so no sample is "outside"; samples
    /// beyond the last voxel centre take the edge value (the resampler's clamp).
    /// </summary>
    private static (Volume<float> Values, Volume<byte> Roi) Resample(Volume<float> image, Volume<byte> mask, ResamplingSettings rs)
    {
        if (!(rs.PartialVolumeThreshold > 0 && rs.PartialVolumeThreshold <= 1))
            throw new InvalidParameterException($"partial-volume threshold {rs.PartialVolumeThreshold} must be in (0, 1]",
                "resampling.partialVolumeThreshold", "IBSI uses 0.5");
        if (rs.SpacingMm.Length != 3)
            throw new InvalidParameterException($"resampling spacing has {rs.SpacingMm.Length} entries; expected 3 (x, y, z)", "resampling.spacingMm");
        var g = image.Geometry;
        var target = ResampleGrid.WithSpacing(g, new Vec3(rs.SpacingMm[0] ?? g.SpacingMm.X, rs.SpacingMm[1] ?? g.SpacingMm.Y, rs.SpacingMm[2] ?? g.SpacingMm.Z));
        var values = Resampler.Resample(image, target, null, Mode(rs.Interpolation));
        if (rs.RoundIntensities)
        {
            var v = values.Voxels;
            for (int n = 0; n < v.Length; n++) v[n] = MathF.Round(v[n], MidpointRounding.AwayFromZero);
        }
        var indicator = new Volume<float>(g);
        var iv = indicator.Voxels;
        var m = mask.Voxels;
        for (int n = 0; n < m.Length; n++) iv[n] = m[n] != 0 ? 1f : 0f;
        var fraction = Resampler.Resample(indicator, target, null, Mode(rs.MaskInterpolation)).Voxels;
        var roi = new Volume<byte>(target);
        var rv = roi.Voxels;
        for (int n = 0; n < rv.Length; n++) rv[n] = fraction[n] >= rs.PartialVolumeThreshold ? (byte)1 : (byte)0;
        return (values, roi);
    }

    private static Interpolation Mode(InterpolationMethod method) =>
        method == InterpolationMethod.Nearest ? Interpolation.Nearest : Interpolation.Linear;

    private static RoiData Crop(Geometry g, Func<int, double> valueAt, Func<int, bool> inRoiAt, RadiomicsSettings settings)
    {
        int sx = g.Size.X, sy = g.Size.Y, sz = g.Size.Z;
        int x0 = sx, y0 = sy, z0 = sz, x1 = -1, y1 = -1, z1 = -1;
        for (int z = 0, n = 0; z < sz; z++)
        for (int y = 0; y < sy; y++)
        for (int x = 0; x < sx; x++, n++)
        {
            if (!inRoiAt(n)) continue;
            x0 = Math.Min(x0, x); x1 = Math.Max(x1, x);
            y0 = Math.Min(y0, y); y1 = Math.Max(y1, y);
            z0 = Math.Min(z0, z); z1 = Math.Max(z1, z);
        }
        if (x1 < 0)
            throw new InputFormatException("the mask has no voxel inside the ROI (all zero)", "mask",
                "supply a mask with at least one non-zero voxel on the image grid");
        // Margin so that the local-intensity sphere around any ROI voxel stays inside the crop.
        var sp = g.SpacingMm;
        int mx = (int)Math.Ceiling(PeakRadiusMm / sp.X), my = (int)Math.Ceiling(PeakRadiusMm / sp.Y), mz = (int)Math.Ceiling(PeakRadiusMm / sp.Z);
        x0 = Math.Max(0, x0 - mx); y0 = Math.Max(0, y0 - my); z0 = Math.Max(0, z0 - mz);
        x1 = Math.Min(sx - 1, x1 + mx); y1 = Math.Min(sy - 1, y1 + my); z1 = Math.Min(sz - 1, z1 + mz);
        int nx = x1 - x0 + 1, ny = y1 - y0 + 1, nz = z1 - z0 + 1;
        var v = new double[nx * ny * nz];
        var morph = new byte[v.Length];
        for (int z = 0, n = 0; z < nz; z++)
        for (int y = 0; y < ny; y++)
        for (int x = 0; x < nx; x++, n++)
        {
            int src = (x + x0) + sx * ((y + y0) + sy * (z + z0));
            v[n] = valueAt(src);
            morph[n] = inRoiAt(src) ? (byte)1 : (byte)0;
        }
        var inRoi = (byte[])morph.Clone();
        ApplyNonFinitePolicy(v, inRoi, settings.NonFiniteIntensities);
        if (settings.Resegmentation is { } rsg) Resegment(v, inRoi, rsg);
        int roiCount = Count(inRoi), morphCount = Count(morph);
        if (roiCount == 0)
            throw new InvalidParameterException("no ROI voxel is left after re-segmentation", "resegmentation",
                "widen the re-segmentation range or turn off outlier filtering");
        var levels = Discretiser.Discretise(v, inRoi, settings.Discretisation, settings.Resegmentation?.RangeMin, "discretisation", MaxTextureBins);
        var ivh = Discretiser.Discretise(v, inRoi, settings.IvhDiscretisation, settings.Resegmentation?.RangeMin, "ivhDiscretisation");
        return new RoiData
        {
            Nx = nx, Ny = ny, Nz = nz, SpacingMm = sp, Intensity = v, Morph = morph, InRoi = inRoi,
            Levels = levels.Levels, BinCount = levels.BinCount, Ivh = ivh, RoiVoxelCount = roiCount, MorphVoxelCount = morphCount,
        };
    }

    private static void ApplyNonFinitePolicy(double[] v, byte[] inRoi, NonFinitePolicy policy)
    {
        int bad = 0, first = -1;
        for (int n = 0; n < v.Length; n++)
        {
            if (inRoi[n] == 0 || double.IsFinite(v[n])) continue;
            if (first < 0) first = n;
            bad++;
            inRoi[n] = 0;
        }
        if (bad > 0 && policy == NonFinitePolicy.Reject)
            throw new InputFormatException($"{bad} ROI voxel(s) have a NaN or infinite intensity (first at crop offset {first})",
                "radiomics image", "fix the image, or set nonFiniteIntensities to \"Exclude\" to drop them from the intensity mask");
        if (Count(inRoi) == 0)
            throw new InputFormatException("every ROI voxel has a NaN or infinite intensity", "radiomics image");
    }

    private static void Resegment(double[] v, byte[] inRoi, ResegmentationSettings r)
    {
        double lo = r.RangeMin ?? double.NegativeInfinity, hi = r.RangeMax ?? double.PositiveInfinity;
        if (lo > hi)
            throw new InvalidParameterException($"re-segmentation range [{lo}, {hi}] is empty", "resegmentation.rangeMin");
        for (int n = 0; n < v.Length; n++)
            if (inRoi[n] != 0 && (v[n] < lo || v[n] > hi)) inRoi[n] = 0;
        if (!r.OutlierFilter3Sd) return;
        // Mean and population SD of the range-filtered ROI, then keep mean ± 3 SD (IBSI 2.5).
        double sum = 0, sum2 = 0; int count = 0;
        for (int n = 0; n < v.Length; n++)
            if (inRoi[n] != 0) { sum += v[n]; count++; }
        if (count == 0) return;
        double mean = sum / count;
        for (int n = 0; n < v.Length; n++)
            if (inRoi[n] != 0) sum2 += (v[n] - mean) * (v[n] - mean);
        double sd = Math.Sqrt(sum2 / count);
        for (int n = 0; n < v.Length; n++)
            if (inRoi[n] != 0 && Math.Abs(v[n] - mean) > 3 * sd) inRoi[n] = 0;
    }

    private static void RequireNonEmpty(byte[] roi, string where, string message)
    {
        if (!roi.AsSpan().ContainsAnyExcept((byte)0))
            throw new InputFormatException(message, where, "supply a mask with at least one non-zero voxel on the image grid");
    }

    private static int Count(byte[] m)
    {
        int c = 0;
        foreach (var b in m) c += b;
        return c;
    }
}
