using Serimetry.Engine.Core;

namespace Serimetry.Tests.Shared;

/// <summary>Which tissue contrast the analytic pelvis is rendered with.</summary>
public enum PhantomContrast { T2w, Adc }

/// <summary>
/// An analytic, anatomically shaped pelvis for registration tests (test-side; invented geometry, known
/// truth): body, lateral muscles, pubic bone, prostate with peripheral and transition zones and a smooth
/// texture, a lesion, rectum and bladder. Object edges are smooth (≈0.7 mm) and each voxel averages
/// sub-samples across the slice, so thick slices show partial volume as in real series. Images of a moved
/// patient are rendered by sampling the analytic function at transformed points, not by resampling voxels.
/// Coordinates are LPS mm with the gland centre at <see cref="GlandCenter"/>.
/// </summary>
public static class RegistrationPhantom
{
    public static readonly Vec3 GlandCenter = new(4, -6, 12);
    private static readonly Vec3 GlandAxes = new(22, 16, 18);

    /// <summary>Centre and semi-axes (mm) of the lesion at baseline (it is the last blob painted).</summary>
    public static readonly Vec3 LesionCenter = GlandCenter + new Vec3(9, 9, -4);
    public static readonly Vec3 LesionAxes = new(6, 5, 6);

    private readonly record struct Blob(Vec3 Center, Vec3 Axes, double T2, double Adc);

    // Painted in order; later objects cover earlier ones. Values: T2w-like and ADC-like (arbitrary units).
    private static readonly Blob[] Blobs =
    [
        new(GlandCenter + new Vec3(0, 10, 0), new Vec3(140, 100, 400), 0.55, 0.08),  // body (fat-dominated)
        new(GlandCenter + new Vec3(-44, 2, 0), new Vec3(14, 28, 60), 0.28, 0.45),     // right obturator muscle
        new(GlandCenter + new Vec3(44, 2, 0), new Vec3(14, 28, 60), 0.28, 0.45),      // left obturator muscle
        new(GlandCenter + new Vec3(0, -36, 6), new Vec3(22, 9, 20), 0.12, 0.05),      // pubic bone
        new(GlandCenter + new Vec3(0, -36, 6), new Vec3(14, 5, 14), 0.45, 0.2),       // marrow
        new(GlandCenter + new Vec3(0, 30, -4), new Vec3(16, 11, 40), 0.3, 0.5),      // rectal wall
        new(GlandCenter + new Vec3(0, 31, -4), new Vec3(10, 6, 38), 0.06, 0.02),     // rectal lumen (air)
        new(GlandCenter + new Vec3(0, -6, 40), new Vec3(30, 25, 22), 0.95, 1.0),     // bladder (urine)
        new(GlandCenter, GlandAxes, 0.8, 0.75),                                       // gland: peripheral zone
        new(GlandCenter + new Vec3(0, -4, 2), new Vec3(15, 10, 13), 0.45, 0.55),     // transition zone
        new(LesionCenter, LesionAxes, 0.3, 0.25),                                     // lesion
    ];

    /// <summary>
    /// The analytic image value at body point <paramref name="b"/> (LPS mm); the lesion's semi-axes are scaled by
    /// <paramref name="lesionScale"/> (a lesion that grew in place by lesionScale³ in volume, replacing gland tissue).
    /// </summary>
    public static double Value(Vec3 b, PhantomContrast contrast, double lesionScale = 1)
    {
        double v = 0;
        for (int q = 0; q < Blobs.Length; q++)
        {
            var blob = Blobs[q];
            double s = Membership(b, blob.Center, q == Blobs.Length - 1 ? blob.Axes * lesionScale : blob.Axes);
            if (s > 0) v += s * ((contrast == PhantomContrast.T2w ? blob.T2 : blob.Adc) - v);
        }
        var d = b - GlandCenter;
        double texture = 1 + 0.07 * Math.Sin(0.61 * d.X + 0.3 * d.Z + 0.4) * Math.Cos(0.47 * d.Y - 0.2 * d.Z)
                           + 0.05 * Math.Sin(0.33 * d.Y + 0.52 * d.X + 1.1) + 0.04 * Math.Cos(0.29 * d.Z + 0.41 * d.Y);
        return v * texture;
    }

    /// <summary>Whether a body point is inside the gland ellipsoid.</summary>
    public static bool InGland(Vec3 b)
    {
        var d = b - GlandCenter;
        return Sq(d.X / GlandAxes.X) + Sq(d.Y / GlandAxes.Y) + Sq(d.Z / GlandAxes.Z) <= 1;
    }

    /// <summary>Whether a body point is inside the lesion ellipsoid scaled by <paramref name="scale"/>.</summary>
    public static bool InLesion(Vec3 b, double scale = 1)
    {
        var d = b - LesionCenter;
        return Sq(d.X / (LesionAxes.X * scale)) + Sq(d.Y / (LesionAxes.Y * scale)) + Sq(d.Z / (LesionAxes.Z * scale)) <= 1;
    }

    /// <summary>The baseline lesion mask on a grid (voxel centres inside the lesion).</summary>
    public static Volume<byte> LesionMask(Geometry grid)
    {
        var m = new Volume<byte>(grid);
        for (int k = 0; k < grid.Size.Z; k++)
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                    if (InLesion(grid.IndexToPhysical(i, j, k))) m[i, j, k] = 1;
        return m;
    }

    /// <summary>A prostate-like T2w grid: 160x160x24 at 0.6x0.6x3 mm (or another size/spacing), centred near the gland.</summary>
    public static Geometry T2Grid(int nx = 160, int ny = 160, int nz = 24, double inPlane = 0.6, double slice = 3.0)
    {
        var size = new Size3(nx, ny, nz);
        var spacing = new Vec3(inPlane, inPlane, slice);
        var center = GlandCenter + new Vec3(1.5, 3, -2);
        var origin = center - new Vec3((nx - 1) / 2.0 * inPlane, (ny - 1) / 2.0 * inPlane, (nz - 1) / 2.0 * slice);
        return Geometry.Axial(size, spacing, origin);
    }

    /// <summary>
    /// Renders the phantom on <paramref name="grid"/> as seen after the patient moved so that body point b
    /// appears at scanner point <paramref name="truth"/>(b): voxel y shows body point truth⁻¹(y). With
    /// <paramref name="truth"/> = identity this is the baseline. Rician noise of σ = <paramref name="noise"/>,
    /// a multiplicative bias field exp(bias·(…)) when <paramref name="bias"/> ≠ 0.
    /// </summary>
    public static Volume<float> Render(Geometry grid, AffineTransform truth, PhantomContrast contrast, double noise, int seed,
        double bias = 0, int inPlaneSubsamples = 1, int sliceSubsamples = 3)
    {
        var inverse = truth.Inverse();
        var vol = new Volume<float>(grid);
        var rngBias = new Random(seed * 7919 + 17);
        double bx = bias * (rngBias.NextDouble() * 2 - 1), by = bias * (rngBias.NextDouble() * 2 - 1), bz = bias * (rngBias.NextDouble() * 2 - 1);
        double bq = bias * (rngBias.NextDouble() * 2 - 1);
        var sp = grid.SpacingMm;
        Parallel.For(0, grid.Size.Z, k =>
        {
            var rng = new Random(seed * 1000 + k);
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                {
                    double acc = 0;
                    int n = 0;
                    for (int a = 0; a < inPlaneSubsamples; a++)
                        for (int c = 0; c < inPlaneSubsamples; c++)
                            for (int s = 0; s < sliceSubsamples; s++)
                            {
                                var off = new Vec3(Offset(a, inPlaneSubsamples), Offset(c, inPlaneSubsamples), Offset(s, sliceSubsamples) * 0.8);
                                var y = grid.IndexToPhysical(new Vec3(i, j, k) + off);
                                acc += Value(inverse.TransformPoint(y), contrast);
                                n++;
                            }
                    double v = acc / n;
                    var p = (grid.IndexToPhysical(i, j, k) - GlandCenter) / 60.0;
                    if (bias != 0) v *= Math.Exp(bx * p.X + by * p.Y + bz * p.Z + bq * (p.X * p.X - p.Y * p.Y));
                    double n1 = noise * Gaussian(rng), n2 = noise * Gaussian(rng);
                    vol[i, j, k] = (float)Math.Sqrt((v + n1) * (v + n1) + n2 * n2);
                }
        });
        return vol;
    }

    /// <summary>The gland mask on a grid (baseline position).</summary>
    public static Volume<byte> GlandMask(Geometry grid)
    {
        var m = new Volume<byte>(grid);
        for (int k = 0; k < grid.Size.Z; k++)
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                    if (InGland(grid.IndexToPhysical(i, j, k))) m[i, j, k] = 1;
        return m;
    }

    /// <summary>A rigid transform about the gland centre: Euler angles (degrees, R = Rz·Rx·Ry) and shift (mm).</summary>
    public static AffineTransform Rigid(double axDeg, double ayDeg, double azDeg, Vec3 shiftMm)
    {
        const double d = Math.PI / 180;
        double cx = Math.Cos(axDeg * d), sx = Math.Sin(axDeg * d), cy = Math.Cos(ayDeg * d), sy = Math.Sin(ayDeg * d);
        double cz = Math.Cos(azDeg * d), sz = Math.Sin(azDeg * d);
        var r = new Mat3(cz, -sz, 0, sz, cz, 0, 0, 0, 1) * new Mat3(1, 0, 0, 0, cx, -sx, 0, sx, cx) * new Mat3(cy, 0, sy, 0, 1, 0, -sy, 0, cy);
        return new AffineTransform(r, GlandCenter + shiftMm - r * GlandCenter);
    }

    /// <summary>A seeded random rigid motion: angles within ±<paramref name="maxDeg"/>, shifts within ±<paramref name="maxShiftMm"/>.</summary>
    public static AffineTransform RandomRigid(int seed, double maxDeg = 10, double maxShiftMm = 15)
    {
        var r = new Random(seed);
        double U(double m) => (r.NextDouble() * 2 - 1) * m;
        return Rigid(U(maxDeg), U(maxDeg), U(maxDeg), new Vec3(U(maxShiftMm), U(maxShiftMm), U(maxShiftMm)));
    }

    /// <summary>Mean target registration error over the gland voxels: mean |T_est(p) − T_true(p)| (mm).</summary>
    public static double GlandTre(Geometry grid, ISpatialTransform estimate, ISpatialTransform truth)
    {
        double sum = 0;
        long n = 0;
        for (int k = 0; k < grid.Size.Z; k++)
            for (int j = 0; j < grid.Size.Y; j++)
                for (int i = 0; i < grid.Size.X; i++)
                {
                    var p = grid.IndexToPhysical(i, j, k);
                    if (!InGland(p)) continue;
                    sum += (estimate.TransformPoint(p) - truth.TransformPoint(p)).Norm;
                    n++;
                }
        return sum / n;
    }

    private static double Membership(Vec3 b, Vec3 center, Vec3 axes)
    {
        var d = b - center;
        double r = Math.Sqrt(Sq(d.X / axes.X) + Sq(d.Y / axes.Y) + Sq(d.Z / axes.Z));
        double mean = (axes.X + axes.Y + axes.Z) / 3;
        double t = (r - 1) * Math.Min(mean, 40) / 0.7;
        if (t > 20) return 0;
        if (t < -20) return 1;
        return 1 / (1 + Math.Exp(t));
    }

    private static double Offset(int i, int n) => n == 1 ? 0 : (i + 0.5) / n - 0.5;

    private static double Gaussian(Random r) =>
        Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());

    private static double Sq(double x) => x * x;
}
