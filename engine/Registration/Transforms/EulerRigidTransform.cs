using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>
/// Rigid transform T(x) = R·(x − c) + c + t about a fixed centre c, with R = Rz·Rx·Ry built from Euler
/// angles (radians) — the angle order of ITK's Euler3DTransform with ComputeZYX off, which elastix's
/// EulerTransform also uses, so parameters can be compared one for one.
/// Parameters: (θx, θy, θz, tx, ty, tz).
/// </summary>
internal sealed class EulerRigidTransform : IParametricTransform
{
    private static readonly string[] Names = ["angleX", "angleY", "angleZ", "tx", "ty", "tz"];
    private Mat3 _rotation = Mat3.Identity;
    private Mat3 _dRdX, _dRdY, _dRdZ;

    public EulerRigidTransform(Vec3 centerMm, Vec3 anglesRad = default, Vec3 translationMm = default)
    {
        CenterMm = centerMm;
        SetParameters([anglesRad.X, anglesRad.Y, anglesRad.Z, translationMm.X, translationMm.Y, translationMm.Z]);
    }

    public Vec3 CenterMm { get; }

    public Vec3 AnglesRad { get; private set; }

    public Vec3 TranslationMm { get; private set; }

    public Mat3 Rotation => _rotation;

    public string Kind => "rigid";

    public int ParameterCount => 6;

    public IReadOnlyList<string> ParameterNames => Names;

    public Vec3 TransformPoint(Vec3 fixedPointMm) => _rotation * (fixedPointMm - CenterMm) + CenterMm + TranslationMm;

    public void GetParameters(Span<double> destination)
    {
        destination[0] = AnglesRad.X; destination[1] = AnglesRad.Y; destination[2] = AnglesRad.Z;
        destination[3] = TranslationMm.X; destination[4] = TranslationMm.Y; destination[5] = TranslationMm.Z;
    }

    public void SetParameters(ReadOnlySpan<double> p)
    {
        AnglesRad = new Vec3(p[0], p[1], p[2]);
        TranslationMm = new Vec3(p[3], p[4], p[5]);
        var (rx, ry, rz) = Factors(p[0], p[1], p[2]);
        var (drx, dry, drz) = FactorDerivatives(p[0], p[1], p[2]);
        _rotation = rz * rx * ry;
        _dRdX = rz * drx * ry;
        _dRdY = rz * rx * dry;
        _dRdZ = drz * rx * ry;
    }

    public void ProjectGradient(Vec3 fixedPointMm, Vec3 g, Span<double> result)
    {
        var d = fixedPointMm - CenterMm;
        result[0] = g.Dot(_dRdX * d);
        result[1] = g.Dot(_dRdY * d);
        result[2] = g.Dot(_dRdZ * d);
        result[3] = g.X;
        result[4] = g.Y;
        result[5] = g.Z;
    }

    public AffineTransform ToAffine() => new(_rotation, CenterMm + TranslationMm - _rotation * CenterMm);

    /// <summary>The rotation matrix Rz·Rx·Ry for Euler angles (radians).</summary>
    public static Mat3 RotationOf(double ax, double ay, double az)
    {
        var (rx, ry, rz) = Factors(ax, ay, az);
        return rz * rx * ry;
    }

    private static (Mat3 Rx, Mat3 Ry, Mat3 Rz) Factors(double ax, double ay, double az)
    {
        double cx = Math.Cos(ax), sx = Math.Sin(ax), cy = Math.Cos(ay), sy = Math.Sin(ay), cz = Math.Cos(az), sz = Math.Sin(az);
        return (new Mat3(1, 0, 0, 0, cx, -sx, 0, sx, cx),
                new Mat3(cy, 0, sy, 0, 1, 0, -sy, 0, cy),
                new Mat3(cz, -sz, 0, sz, cz, 0, 0, 0, 1));
    }

    private static (Mat3 dRx, Mat3 dRy, Mat3 dRz) FactorDerivatives(double ax, double ay, double az)
    {
        double cx = Math.Cos(ax), sx = Math.Sin(ax), cy = Math.Cos(ay), sy = Math.Sin(ay), cz = Math.Cos(az), sz = Math.Sin(az);
        return (new Mat3(0, 0, 0, 0, -sx, -cx, 0, cx, -sx),
                new Mat3(-sy, 0, cy, 0, 0, 0, -cy, 0, -sy),
                new Mat3(-sz, -cz, 0, cz, -sz, 0, 0, 0, 0));
    }
}
