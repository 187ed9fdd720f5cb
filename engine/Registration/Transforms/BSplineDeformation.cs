using System.Runtime.CompilerServices;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>
/// Cubic B-spline free-form deformation after a bulk affine map (Rueckert et al., "Nonrigid registration
/// using free-form deformations", IEEE TMI 18(8), 1999): T(x) = A(x) + u(x), u(x) = Σ_k c_k β³(ξ(x) − k),
/// with ξ(x) = Dᵀ(x − o)/s the continuous control-grid index (o origin, s spacing per axis, D direction).
/// The displacement u is added in moving space after the affine part, so its coefficients are in mm and
/// the affine part alone is still what the 4x4 matrix of transform.json says. Each point depends on 4x4x4
/// control points; outside the grid support u is 0. Maps fixed LPS mm to moving LPS mm.
/// Coefficients are stored axis-major: index d·N + p, d ∈ {x, y, z} (LPS), p = i + nx·(j + ny·k).
/// </summary>
public sealed class BSplineDeformation : ISpatialTransform
{
    /// <summary>Control points influencing one point (4x4x4).</summary>
    public const int SupportSize = 64;

    private readonly double[] _c;
    private readonly Mat3 _toIndex;
    private readonly Mat3 _gradientMap;

    /// <summary>A deformation with the given grid and coefficients (copied); zero coefficients when null.</summary>
    public BSplineDeformation(AffineTransform bulk, Vec3 gridOriginMm, Vec3 gridSpacingMm, Size3 gridSize, Mat3 gridDirection,
        IReadOnlyList<double>? coefficients = null)
    {
        ArgumentNullException.ThrowIfNull(bulk);
        if (gridSize.X < 4 || gridSize.Y < 4 || gridSize.Z < 4)
            throw new InvalidParameterException($"control grid {gridSize} is smaller than 4x4x4", "bspline grid size", "at least 4 control points per axis");
        if (!(gridSpacingMm.X > 0 && gridSpacingMm.Y > 0 && gridSpacingMm.Z > 0))
            throw new InvalidParameterException($"control grid spacing {gridSpacingMm} is not positive", "bspline grid spacing");
        Bulk = bulk;
        GridOriginMm = gridOriginMm;
        GridSpacingMm = gridSpacingMm;
        GridSize = gridSize;
        GridDirection = gridDirection;
        int n = checked((int)gridSize.Count * 3);
        _c = new double[n];
        if (coefficients is not null)
        {
            if (coefficients.Count != n)
                throw new InvalidParameterException($"{coefficients.Count} coefficients for a {gridSize} grid", "bspline coefficients", $"{n} values (3 per control point)");
            for (int i = 0; i < n; i++) _c[i] = coefficients[i];
        }
        var inv = Mat3.Diagonal(new Vec3(1 / gridSpacingMm.X, 1 / gridSpacingMm.Y, 1 / gridSpacingMm.Z));
        _toIndex = inv * gridDirection.Transpose();
        _gradientMap = gridDirection * inv;
    }

    /// <summary>
    /// A zero deformation whose control grid (spacing <paramref name="spacingMm"/> on every axis, axes along
    /// <paramref name="domain"/>'s direction) covers the domain's voxel centres with one extra control point
    /// before and two after on each axis, the border cubic B-splines need.
    /// </summary>
    public static BSplineDeformation Covering(Geometry domain, double spacingMm, AffineTransform bulk)
    {
        ArgumentNullException.ThrowIfNull(domain);
        if (!(spacingMm > 0)) throw new InvalidParameterException($"control point spacing {spacingMm} mm", "bspline grid spacing", "a positive spacing in mm");
        var ext = new Vec3((domain.Size.X - 1) * domain.SpacingMm.X, (domain.Size.Y - 1) * domain.SpacingMm.Y, (domain.Size.Z - 1) * domain.SpacingMm.Z);
        int N(double e) => (int)Math.Floor(e / spacingMm) + 4;
        var size = new Size3(N(ext.X), N(ext.Y), N(ext.Z));
        // Centre the grid on the domain so the margins are equal on both sides.
        var span = new Vec3((size.X - 3) * spacingMm, (size.Y - 3) * spacingMm, (size.Z - 3) * spacingMm);
        var lo = (ext - span) / 2 - new Vec3(spacingMm, spacingMm, spacingMm);
        var origin = domain.OriginMm + domain.Direction * lo;
        return new BSplineDeformation(bulk, origin, new Vec3(spacingMm, spacingMm, spacingMm), size, domain.Direction);
    }

    /// <summary>The affine part A (fixed LPS mm → moving LPS mm) applied before the displacement is added.</summary>
    public AffineTransform Bulk { get; }

    /// <summary>Position (LPS mm) of control point (0, 0, 0).</summary>
    public Vec3 GridOriginMm { get; }

    public Vec3 GridSpacingMm { get; }
    public Size3 GridSize { get; }

    /// <summary>Direction cosines of the control grid axes (columns).</summary>
    public Mat3 GridDirection { get; }

    /// <summary>Control point count N (the coefficient count is 3N).</summary>
    public int PointCount => _c.Length / 3;

    /// <summary>Displacement coefficients (mm), axis-major (see the type's summary).</summary>
    public IReadOnlyList<double> Coefficients => _c;

    internal double[] CoefficientArray => _c;

    /// <summary>A copy with the same grid and a different bulk transform or coefficients.</summary>
    public BSplineDeformation With(AffineTransform? bulk = null, IReadOnlyList<double>? coefficients = null) =>
        new(bulk ?? Bulk, GridOriginMm, GridSpacingMm, GridSize, GridDirection, coefficients ?? _c);

    /// <inheritdoc />
    public Vec3 TransformPoint(Vec3 fixedPointMm) => Bulk.TransformPoint(fixedPointMm) + Displacement(fixedPointMm);

    /// <summary>u(x), the B-spline displacement (mm) added after the affine part.</summary>
    public Vec3 Displacement(Vec3 fixedPointMm)
    {
        Span<int> idx = stackalloc int[SupportSize];
        Span<double> w = stackalloc double[SupportSize];
        if (!Support(fixedPointMm, idx, w)) return Vec3.Zero;
        return Sum(idx, w);
    }

    /// <summary>∂T/∂x at a point: the affine linear part plus ∂u/∂x.</summary>
    public Mat3 SpatialJacobian(Vec3 fixedPointMm)
    {
        var ci = _toIndex * (fixedPointMm - GridOriginMm);
        int bx = (int)Math.Floor(ci.X) - 1, by = (int)Math.Floor(ci.Y) - 1, bz = (int)Math.Floor(ci.Z) - 1;
        Span<double> wx = stackalloc double[4], wy = stackalloc double[4], wz = stackalloc double[4];
        Span<double> dx = stackalloc double[4], dy = stackalloc double[4], dz = stackalloc double[4];
        Weights(ci.X - bx - 1, wx, dx);
        Weights(ci.Y - by - 1, wy, dy);
        Weights(ci.Z - bz - 1, wz, dz);
        int n = PointCount, nx = GridSize.X, ny = GridSize.Y;
        // g[d, a] = ∂u_d/∂ξ_a
        Span<double> g = stackalloc double[9];
        for (int c = 0; c < 4; c++)
        {
            int k = bz + c;
            if ((uint)k >= (uint)GridSize.Z) continue;
            for (int b = 0; b < 4; b++)
            {
                int j = by + b;
                if ((uint)j >= (uint)ny) continue;
                for (int a = 0; a < 4; a++)
                {
                    int i = bx + a;
                    if ((uint)i >= (uint)nx) continue;
                    int p = i + nx * (j + ny * k);
                    double ga = dx[a] * wy[b] * wz[c], gb = wx[a] * dy[b] * wz[c], gc = wx[a] * wy[b] * dz[c];
                    for (int d = 0; d < 3; d++)
                    {
                        double v = _c[d * n + p];
                        g[d * 3] += v * ga; g[d * 3 + 1] += v * gb; g[d * 3 + 2] += v * gc;
                    }
                }
            }
        }
        // ∂u_d/∂x_j = Σ_a g[d,a] ∂ξ_a/∂x_j, ∂ξ/∂x = _toIndex.
        var du = new Mat3(g[0], g[1], g[2], g[3], g[4], g[5], g[6], g[7], g[8]) * _toIndex;
        var l = Bulk.Linear;
        return new Mat3(l.M00 + du.M00, l.M01 + du.M01, l.M02 + du.M02, l.M10 + du.M10, l.M11 + du.M11, l.M12 + du.M12,
            l.M20 + du.M20, l.M21 + du.M21, l.M22 + du.M22);
    }

    /// <summary>det(∂T/∂x): local volume ratio moving/fixed (1 = no change, &lt; 1 compression, ≤ 0 folding).</summary>
    public double JacobianDeterminant(Vec3 fixedPointMm) => SpatialJacobian(fixedPointMm).Determinant;

    /// <summary>The Jacobian determinant at every voxel centre of <paramref name="grid"/>.</summary>
    public Volume<float> JacobianDeterminantField(Geometry grid, int maxThreads = -1)
    {
        ArgumentNullException.ThrowIfNull(grid);
        var vol = new Volume<float>(grid);
        var v = vol.Voxels;
        int nx = grid.Size.X, nxy = nx * grid.Size.Y;
        ParallelRange.For(v.Length, 4096, (_, start, end) =>
        {
            for (int idx = start; idx < end; idx++)
            {
                int k = idx / nxy, r = idx - k * nxy, j = r / nx, i = r - j * nx;
                v[idx] = (float)JacobianDeterminant(grid.IndexToPhysical(i, j, k));
            }
        }, maxThreads);
        return vol;
    }

    /// <summary>
    /// The 64 control points (coefficient index p of the x component) and weights β³ products for a point;
    /// indices of points outside the grid are −1 with weight 0. False when no control point influences it.
    /// </summary>
    internal bool Support(Vec3 fixedPointMm, Span<int> indices, Span<double> weights)
    {
        var ci = _toIndex * (fixedPointMm - GridOriginMm);
        if (!(ci.X > -2 && ci.Y > -2 && ci.Z > -2 && ci.X < GridSize.X + 1 && ci.Y < GridSize.Y + 1 && ci.Z < GridSize.Z + 1))
            return false;
        int bx = (int)Math.Floor(ci.X) - 1, by = (int)Math.Floor(ci.Y) - 1, bz = (int)Math.Floor(ci.Z) - 1;
        Span<double> wx = stackalloc double[4], wy = stackalloc double[4], wz = stackalloc double[4];
        Span<double> scratch = stackalloc double[4];
        Weights(ci.X - bx - 1, wx, scratch);
        Weights(ci.Y - by - 1, wy, scratch);
        Weights(ci.Z - bz - 1, wz, scratch);
        bool any = false;
        for (int c = 0, m = 0; c < 4; c++)
            for (int b = 0; b < 4; b++)
                for (int a = 0; a < 4; a++, m++)
                {
                    int p = indices[m] = ControlPointIndex(bx + a, by + b, bz + c);
                    weights[m] = p < 0 ? 0 : wx[a] * wy[b] * wz[c];
                    any |= p >= 0;
                }
        return any;
    }

    /// <summary>Flat index of control point (i, j, k) (x component), or −1 outside the grid.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    private int ControlPointIndex(int i, int j, int k) =>
        (uint)i >= (uint)GridSize.X || (uint)j >= (uint)GridSize.Y || (uint)k >= (uint)GridSize.Z ? -1 : i + GridSize.X * (j + GridSize.Y * k);

    /// <summary>Position (LPS mm) of control point (i, j, k).</summary>
    public Vec3 ControlPointPosition(int i, int j, int k) =>
        GridOriginMm + GridDirection * new Vec3(i * GridSpacingMm.X, j * GridSpacingMm.Y, k * GridSpacingMm.Z);

    /// <summary>The 64 supporting control points of a point and the physical gradients (per mm) of their basis functions.</summary>
    internal void SupportGradients(Vec3 fixedPointMm, Span<int> indices, Span<double> gx, Span<double> gy, Span<double> gz)
    {
        var ci = _toIndex * (fixedPointMm - GridOriginMm);
        int bx = (int)Math.Floor(ci.X) - 1, by = (int)Math.Floor(ci.Y) - 1, bz = (int)Math.Floor(ci.Z) - 1;
        Span<double> wx = stackalloc double[4], wy = stackalloc double[4], wz = stackalloc double[4];
        Span<double> dx = stackalloc double[4], dy = stackalloc double[4], dz = stackalloc double[4];
        Weights(ci.X - bx - 1, wx, dx);
        Weights(ci.Y - by - 1, wy, dy);
        Weights(ci.Z - bz - 1, wz, dz);
        var t = _toIndex;
        for (int c = 0, m = 0; c < 4; c++)
            for (int b = 0; b < 4; b++)
                for (int a = 0; a < 4; a++, m++)
                {
                    if ((indices[m] = ControlPointIndex(bx + a, by + b, bz + c)) < 0)
                    {
                        gx[m] = gy[m] = gz[m] = 0;
                        continue;
                    }
                    double da = dx[a] * wy[b] * wz[c], db = wx[a] * dy[b] * wz[c], dc = wx[a] * wy[b] * dz[c];
                    // ∂β/∂x_j = Σ_a ∂β/∂ξ_a · ∂ξ_a/∂x_j
                    gx[m] = da * t.M00 + db * t.M10 + dc * t.M20;
                    gy[m] = da * t.M01 + db * t.M11 + dc * t.M21;
                    gz[m] = da * t.M02 + db * t.M12 + dc * t.M22;
                }
    }

    /// <summary>Σ w_m c_m over a support.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal Vec3 Sum(ReadOnlySpan<int> indices, ReadOnlySpan<double> weights)
    {
        int n = PointCount;
        double x = 0, y = 0, z = 0;
        for (int m = 0; m < SupportSize; m++)
        {
            int p = indices[m];
            if (p < 0) continue;
            double w = weights[m];
            x += w * _c[p]; y += w * _c[n + p]; z += w * _c[2 * n + p];
        }
        return new Vec3(x, y, z);
    }

    /// <summary>The four cubic B-spline weights β³(t + 1 − m), m = 0..3, for fraction t ∈ [0, 1), and their derivatives.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static void Weights(double t, Span<double> w, Span<double> dw)
    {
        double s = 1 - t, t2 = t * t, t3 = t2 * t;
        w[0] = s * s * s / 6;
        w[1] = (3 * t3 - 6 * t2 + 4) / 6;
        w[2] = (-3 * t3 + 3 * t2 + 3 * t + 1) / 6;
        w[3] = t3 / 6;
        dw[0] = -s * s / 2;
        dw[1] = 1.5 * t2 - 2 * t;
        dw[2] = -1.5 * t2 + t + 0.5;
        dw[3] = t2 / 2;
    }
}
