using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging;

/// <summary>
/// Maps target voxel indices to continuous indices of the moving image: target index → LPS point (target
/// geometry) → moving point (the fixed-to-moving transform) → moving continuous index. For an affine (or no)
/// transform the whole chain is one affine map c_m = M·c_t + b, evaluated per row as start + i·step;
/// any other <see cref="ISpatialTransform"/> is evaluated per voxel without allocation.
/// </summary>
internal sealed class IndexMapping
{
    /// <summary>Continuous indices this close to an integer are snapped to it (1e-7 voxel), so that grids
    /// which coincide up to rounding sample voxel centres exactly.</summary>
    public const double SnapTolerance = 1e-7;

    private readonly Geometry _target;
    private readonly Geometry _moving;
    private readonly ISpatialTransform? _general;
    private readonly Mat3 _m;
    private readonly Vec3 _b;

    public IndexMapping(Geometry target, Geometry moving, ISpatialTransform? fixedToMoving)
    {
        _target = target;
        _moving = moving;
        var affine = fixedToMoving switch
        {
            null => AffineTransform.Identity,
            AffineTransform a => a,
            _ => null,
        };
        if (affine is null)
        {
            _general = fixedToMoving;
            return;
        }
        _m = moving.PhysicalToIndexMatrix * affine.Linear * target.IndexToPhysicalMatrix;
        _b = moving.PhysicalToIndexMatrix * (affine.Linear * target.OriginMm + affine.TranslationMm - moving.OriginMm);
    }

    /// <summary>Whether the fast affine path is used.</summary>
    public bool IsAffine => _general is null;

    /// <summary>Fills the moving continuous indices of target row (j, k), i = 0..x.Length−1.</summary>
    public void MapRow(int j, int k, Span<double> x, Span<double> y, Span<double> z)
    {
        if (_general is null)
        {
            var start = _m * new Vec3(0, j, k) + _b;
            double sx = _m.M00, sy = _m.M10, sz = _m.M20;
            for (int i = 0; i < x.Length; i++)
            {
                x[i] = Snap(start.X + i * sx);
                y[i] = Snap(start.Y + i * sy);
                z[i] = Snap(start.Z + i * sz);
            }
            return;
        }
        for (int i = 0; i < x.Length; i++)
        {
            var c = _moving.PhysicalToIndex(_general.TransformPoint(_target.IndexToPhysical(i, j, k)));
            x[i] = Snap(c.X);
            y[i] = Snap(c.Y);
            z[i] = Snap(c.Z);
        }
    }

    private static double Snap(double c)
    {
        double r = Math.Round(c);
        return Math.Abs(c - r) < SnapTolerance ? r : c;
    }
}
