using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;

namespace Serimetry.Bench;

/// <summary>
/// Resampling a T2w-sized volume (384x384x24 float, 0.5x0.5x3.6 mm) onto its own grid under a small rigid
/// rotation (3° about an oblique axis, 2 mm shift): the registration inner loop. Voxels/s = 3,538,944 / mean time.
/// </summary>
[SimpleJob(launchCount: 1, warmupCount: 2, iterationCount: 8)]
[MemoryDiagnoser]
public class ResampleBenchmarks
{
    private Volume<float> _moving = null!;
    private AffineTransform _transform = null!;
    private ISpatialTransform _opaque = null!;

    [Params(Interpolation.Nearest, Interpolation.Linear, Interpolation.CubicBSpline)]
    public Interpolation Mode { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var g = Geometry.Axial(new Size3(384, 384, 24), new Vec3(0.5, 0.5, 3.6), new Vec3(-96, -96, -43));
        _moving = new Volume<float>(g);
        var rng = new Random(1);
        for (int i = 0; i < _moving.Voxels.Length; i++) _moving.Voxels[i] = (float)(rng.NextDouble() * 1000);
        double a = 3 * Math.PI / 180;
        var axis = new Vec3(0.2, 0.3, 0.93).Normalized();
        _transform = new AffineTransform(AxisAngle(axis, a), new Vec3(2, -1, 0.5));
        _opaque = new Opaque(_transform);
    }

    /// <summary>Affine fast path (one index-space affine per call).</summary>
    [Benchmark(Baseline = true)]
    public Volume<float> AffinePath() => Resampler.Resample(_moving, _moving.Geometry, _transform, Mode, 0f);

    /// <summary>General transform path (per-voxel point mapping through the interface).</summary>
    [Benchmark]
    public Volume<float> GeneralPath() => Resampler.Resample(_moving, _moving.Geometry, _opaque, Mode, 0f);

    private sealed class Opaque(AffineTransform inner) : ISpatialTransform
    {
        public Vec3 TransformPoint(Vec3 fixedPointMm) => inner.TransformPoint(fixedPointMm);
    }

    private static Mat3 AxisAngle(Vec3 u, double angle)
    {
        double c = Math.Cos(angle), s = Math.Sin(angle), t = 1 - c;
        return new Mat3(
            t * u.X * u.X + c, t * u.X * u.Y - s * u.Z, t * u.X * u.Z + s * u.Y,
            t * u.X * u.Y + s * u.Z, t * u.Y * u.Y + c, t * u.Y * u.Z - s * u.X,
            t * u.X * u.Z - s * u.Y, t * u.Y * u.Z + s * u.X, t * u.Z * u.Z + c);
    }
}
