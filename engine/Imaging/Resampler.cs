using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>
/// Resamples an image onto another voxel grid through physical space (LPS, mm): every target voxel centre p
/// is mapped by the fixed-to-moving transform (identity when null) and then to the moving image's continuous
/// index with <see cref="Geometry.PhysicalToIndex"/>, so oblique, flipped and anisotropic grids are handled
/// exactly. Affine transforms use one precomputed index-space affine per call; any other transform is
/// evaluated per voxel. Work is split over fixed z-slice partitions; results do not depend on thread count.
/// </summary>
public static class Resampler
{
    /// <summary>
    /// The moving image sampled on <paramref name="target"/>. <paramref name="fixedToMoving"/> maps target
    /// (fixed) points to moving points, the registration convention of <see cref="ISpatialTransform"/>.
    /// Target voxels whose moving index falls outside [−0.5, n−0.5] on any axis get <paramref name="outsideValue"/>.
    /// </summary>
    public static Volume<float> Resample(Volume<float> moving, Geometry target, ISpatialTransform? fixedToMoving,
        Interpolation mode, float outsideValue = 0f) => Resample(moving, target, fixedToMoving, mode, outsideValue, -1);

    /// <summary>As <see cref="Resample(Volume{float}, Geometry, ISpatialTransform?, Interpolation, float)"/> with a thread limit (tests).</summary>
    internal static Volume<float> Resample(Volume<float> moving, Geometry target, ISpatialTransform? fixedToMoving,
        Interpolation mode, float outsideValue, int maxDegree)
    {
        ArgumentNullException.ThrowIfNull(moving);
        ArgumentNullException.ThrowIfNull(target);
        var output = new Volume<float>(target);
        var mapping = new IndexMapping(target, moving.Geometry, fixedToMoving);
        double[]? coefficients = mode == Interpolation.CubicBSpline ? BSplineCoefficients.Compute(moving, maxDegree) : null;
        var src = moving.Voxels;
        var n = moving.Size;
        ForEachRow(output, mapping, maxDegree, (xs, ys, zs, row) =>
        {
            switch (mode)
            {
                case Interpolation.Nearest: RowSampler.Nearest<float>(src, n, xs, ys, zs, row, outsideValue); break;
                case Interpolation.Linear: RowSampler.Linear(src, n, xs, ys, zs, row, outsideValue); break;
                case Interpolation.CubicBSpline: RowSampler.CubicBSpline(coefficients, n, xs, ys, zs, row, outsideValue); break;
                default: throw new InvalidParameterException($"unknown interpolation mode {mode}", "resampling");
            }
        });
        return output;
    }

    /// <summary>
    /// A mask (label volume) on <paramref name="target"/>: nearest neighbour keeps labels as they are;
    /// <see cref="MaskInterpolation.LinearThreshold"/> interpolates a binary mask's 0/1 indicator trilinearly and
    /// keeps voxels at ≥ 0.5 (IBSI). Outside the mask's grid is 0.
    /// </summary>
    public static Volume<byte> ResampleMask(Volume<byte> mask, Geometry target, ISpatialTransform? fixedToMoving,
        MaskInterpolation mode = MaskInterpolation.Nearest) => ResampleMask(mask, target, fixedToMoving, mode, -1);

    internal static Volume<byte> ResampleMask(Volume<byte> mask, Geometry target, ISpatialTransform? fixedToMoving,
        MaskInterpolation mode, int maxDegree)
    {
        ArgumentNullException.ThrowIfNull(mask);
        ArgumentNullException.ThrowIfNull(target);
        if (mode == MaskInterpolation.LinearThreshold) return ResampleBinaryMask(mask, target, fixedToMoving, maxDegree);
        var output = new Volume<byte>(target);
        var mapping = new IndexMapping(target, mask.Geometry, fixedToMoving);
        var src = mask.Voxels;
        var n = mask.Size;
        ForEachRow(output, mapping, maxDegree, (xs, ys, zs, row) => RowSampler.Nearest<byte>(src, n, xs, ys, zs, row, 0));
        return output;
    }

    private static Volume<byte> ResampleBinaryMask(Volume<byte> mask, Geometry target, ISpatialTransform? fixedToMoving, int maxDegree)
    {
        byte label = SingleLabel(mask);
        var indicator = new float[mask.Voxels.Length];
        var src = mask.Voxels;
        for (int i = 0; i < src.Length; i++) indicator[i] = src[i] != 0 ? 1f : 0f;
        var fraction = Resample(new Volume<float>(mask.Geometry, indicator), target, fixedToMoving, Interpolation.Linear, 0f, maxDegree);
        var output = new Volume<byte>(target);
        var f = fraction.Voxels;
        var o = output.Voxels;
        for (int i = 0; i < f.Length; i++) o[i] = f[i] >= 0.5f ? label : (byte)0;
        return output;
    }

    /// <summary>The one non-zero label of a binary mask (1 when empty); refuses label maps.</summary>
    private static byte SingleLabel(Volume<byte> mask)
    {
        byte label = 0;
        foreach (byte v in mask.Voxels)
        {
            if (v == 0 || v == label) continue;
            if (label != 0)
                throw new InvalidParameterException(
                    $"linear-threshold mask resampling needs a binary mask, but the mask holds labels {label} and {v}",
                    "mask resampling", "use nearest-neighbour resampling for label maps, or resample each label separately");
            label = v;
        }
        return label == 0 ? (byte)1 : label;
    }

    private delegate void RowAction<T>(ReadOnlySpan<double> xs, ReadOnlySpan<double> ys, ReadOnlySpan<double> zs, Span<T> row);

    /// <summary>Runs <paramref name="sample"/> over every output row, mapping indices first; scratch is per partition.</summary>
    private static void ForEachRow<T>(Volume<T> output, IndexMapping mapping, int maxDegree, RowAction<T> sample) where T : unmanaged
    {
        var size = output.Size;
        var voxels = output.Voxels;
        ParallelRange.For(size.Z, 1, (_, k0, k1) =>
        {
            var xs = new double[size.X];
            var ys = new double[size.X];
            var zs = new double[size.X];
            for (int k = k0; k < k1; k++)
            {
                for (int j = 0; j < size.Y; j++)
                {
                    mapping.MapRow(j, k, xs, ys, zs);
                    sample(xs, ys, zs, voxels.AsSpan((k * size.Y + j) * size.X, size.X));
                }
            }
        }, maxDegree);
    }
}
