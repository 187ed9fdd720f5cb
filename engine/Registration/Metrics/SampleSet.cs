using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Metrics;

/// <summary>
/// The fixed-image points a metric is evaluated on: physical positions (LPS mm) of voxel centres and the
/// fixed intensities there. Drawn once per resolution level, with replacement, from the voxels inside the
/// fixed mask with finite values, by a seeded generator — the same seed gives the same samples on every
/// machine and thread count. Random samples are placed at a random point inside their voxel (the fixed
/// value interpolated there); "every voxel" uses the voxel centres.
/// </summary>
internal sealed class SampleSet
{
    private SampleSet(double[] x, double[] y, double[] z, float[] values)
    {
        X = x; Y = y; Z = z; FixedValues = values;
    }

    public double[] X { get; }
    public double[] Y { get; }
    public double[] Z { get; }
    public float[] FixedValues { get; }
    public int Count => FixedValues.Length;

    public Vec3 Point(int i) => new(X[i], Y[i], Z[i]);

    /// <summary>
    /// Draws <paramref name="requested"/> samples (0, or at least the number of candidate voxels, means
    /// every candidate voxel once, in index order).
    /// </summary>
    public static SampleSet Draw(Volume<float> fixedImage, Volume<byte>? mask, int requested, int seed, bool jitter = true)
    {
        var candidates = Candidates(fixedImage, mask);
        if (candidates.Length == 0)
            throw new RegistrationException("the fixed image has no finite voxel inside the mask at this resolution",
                "check the fixed mask overlaps the image and is not empty");
        int n = requested <= 0 || requested >= candidates.Length ? candidates.Length : requested;
        var x = new double[n];
        var y = new double[n];
        var z = new double[n];
        var v = new float[n];
        var rng = new Random(seed);
        bool all = n == candidates.Length;
        var g = fixedImage.Geometry;
        var interp = new Interpolation.LinearInterpolator(fixedImage);
        int nx = g.Size.X, nxy = g.Size.X * g.Size.Y;
        for (int s = 0; s < n; s++)
        {
            int idx = all ? candidates[s] : candidates[rng.Next(candidates.Length)];
            int k = idx / nxy, rem = idx - k * nxy, j = rem / nx, i = rem - j * nx;
            var p = g.IndexToPhysical(i, j, k);
            float value = fixedImage.Voxels[idx];
            if (jitter && !all)
            {
                // A random point within the voxel: sample positions off the grid avoid the bias of linear
                // interpolation towards grid-aligned solutions (cf. elastix's RandomCoordinate sampler).
                var c = new Vec3(i + rng.NextDouble() - 0.5, j + rng.NextDouble() - 0.5, k + rng.NextDouble() - 0.5);
                var q = g.IndexToPhysical(c);
                if (interp.TryEvaluate(q, out double fv) && double.IsFinite(fv)) { p = q; value = (float)fv; }
            }
            x[s] = p.X; y[s] = p.Y; z[s] = p.Z;
            v[s] = value;
        }
        return new SampleSet(x, y, z, v);
    }

    private static int[] Candidates(Volume<float> image, Volume<byte>? mask)
    {
        var vox = image.Voxels;
        var m = mask?.Voxels;
        int count = 0;
        for (int i = 0; i < vox.Length; i++)
            if ((m is null || m[i] != 0) && float.IsFinite(vox[i])) count++;
        var result = new int[count];
        int w = 0;
        for (int i = 0; i < vox.Length; i++)
            if ((m is null || m[i] != 0) && float.IsFinite(vox[i])) result[w++] = i;
        return result;
    }
}
