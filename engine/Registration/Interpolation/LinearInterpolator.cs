using System.Runtime.CompilerServices;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Interpolation;

/// <summary>
/// Trilinear interpolation of a float volume at physical points (LPS mm), with the exact derivative of
/// the interpolant (so metric gradients match finite differences of the metric). Points within half a
/// voxel outside the outer voxel centres are clamped to the edge (thick-slice series keep their first and
/// last slice); points further out are "outside". Thread-safe and allocation-free per call.
/// </summary>
internal sealed class LinearInterpolator
{
    private readonly float[] _v;
    private readonly int _nx, _ny, _nz, _sy, _sz;
    private readonly Mat3 _toIndex;
    private readonly Vec3 _origin;

    public LinearInterpolator(Volume<float> image)
    {
        _v = image.Voxels;
        _nx = image.Size.X; _ny = image.Size.Y; _nz = image.Size.Z;
        _sy = _nx; _sz = _nx * _ny;
        _toIndex = image.Geometry.PhysicalToIndexMatrix;
        _origin = image.Geometry.OriginMm;
        Geometry = image.Geometry;
    }

    public Geometry Geometry { get; }

    /// <summary>Value at <paramref name="pointMm"/>; false when the point is outside the image.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public bool TryEvaluate(Vec3 pointMm, out double value)
    {
        var c = _toIndex * (pointMm - _origin);
        if (!Locate(c.X, _nx, out int x0, out int x1, out double fx) || !Locate(c.Y, _ny, out int y0, out int y1, out double fy)
            || !Locate(c.Z, _nz, out int z0, out int z1, out double fz))
        {
            value = 0;
            return false;
        }
        int r00 = y0 * _sy + z0 * _sz, r10 = y1 * _sy + z0 * _sz, r01 = y0 * _sy + z1 * _sz, r11 = y1 * _sy + z1 * _sz;
        double a00 = _v[r00 + x0] + fx * (_v[r00 + x1] - _v[r00 + x0]);
        double a10 = _v[r10 + x0] + fx * (_v[r10 + x1] - _v[r10 + x0]);
        double a01 = _v[r01 + x0] + fx * (_v[r01 + x1] - _v[r01 + x0]);
        double a11 = _v[r11 + x0] + fx * (_v[r11 + x1] - _v[r11 + x0]);
        double b0 = a00 + fy * (a10 - a00), b1 = a01 + fy * (a11 - a01);
        value = b0 + fz * (b1 - b0);
        return true;
    }

    /// <summary>Value and physical gradient (per mm) at <paramref name="pointMm"/>; false when outside.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public bool TryEvaluate(Vec3 pointMm, out double value, out Vec3 gradientPerMm)
    {
        var c = _toIndex * (pointMm - _origin);
        if (!Locate(c.X, _nx, out int x0, out int x1, out double fx) || !Locate(c.Y, _ny, out int y0, out int y1, out double fy)
            || !Locate(c.Z, _nz, out int z0, out int z1, out double fz))
        {
            value = 0;
            gradientPerMm = default;
            return false;
        }
        int r00 = y0 * _sy + z0 * _sz, r10 = y1 * _sy + z0 * _sz, r01 = y0 * _sy + z1 * _sz, r11 = y1 * _sy + z1 * _sz;
        double v000 = _v[r00 + x0], v100 = _v[r00 + x1], v010 = _v[r10 + x0], v110 = _v[r10 + x1];
        double v001 = _v[r01 + x0], v101 = _v[r01 + x1], v011 = _v[r11 + x0], v111 = _v[r11 + x1];
        double a00 = v000 + fx * (v100 - v000), a10 = v010 + fx * (v110 - v010);
        double a01 = v001 + fx * (v101 - v001), a11 = v011 + fx * (v111 - v011);
        double b0 = a00 + fy * (a10 - a00), b1 = a01 + fy * (a11 - a01);
        value = b0 + fz * (b1 - b0);
        // Derivatives of the interpolant in index units (zero along an axis clamped at the edge: x0 == x1).
        double dx0 = (1 - fy) * (v100 - v000) + fy * (v110 - v010);
        double dx1 = (1 - fy) * (v101 - v001) + fy * (v111 - v011);
        double gx = x1 == x0 ? 0 : dx0 + fz * (dx1 - dx0);
        double gy = y1 == y0 ? 0 : (a10 - a00) + fz * ((a11 - a01) - (a10 - a00));
        double gz = z1 == z0 ? 0 : b1 - b0;
        // ∇_physical = (∂index/∂physical)ᵀ · ∇_index
        var m = _toIndex;
        gradientPerMm = new Vec3(
            m.M00 * gx + m.M10 * gy + m.M20 * gz,
            m.M01 * gx + m.M11 * gy + m.M21 * gz,
            m.M02 * gx + m.M12 * gy + m.M22 * gz);
        return true;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static bool Locate(double c, int n, out int i0, out int i1, out double f)
    {
        if (!(c >= -0.5 && c <= n - 0.5))
        {
            i0 = i1 = 0; f = 0;
            return false;
        }
        if (c <= 0) { i0 = i1 = 0; f = 0; return true; }
        if (c >= n - 1) { i0 = i1 = n - 1; f = 0; return true; }
        i0 = (int)c;
        i1 = i0 + 1;
        f = c - i0;
        return true;
    }
}
