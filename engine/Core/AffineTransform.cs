namespace Serimetry.Engine.Core;

/// <summary>
/// An affine map y = A·x + t in physical space (LPS, mm), from fixed-image points to moving-image points.
/// Serialised as a 4x4 row-major matrix [A t; 0 0 0 1].
/// </summary>
public sealed record AffineTransform(Mat3 Linear, Vec3 TranslationMm) : ISpatialTransform
{
    public static readonly AffineTransform Identity = new(Mat3.Identity, Vec3.Zero);

    public Vec3 TransformPoint(Vec3 fixedPointMm) => Linear * fixedPointMm + TranslationMm;

    /// <summary>The inverse map (moving → fixed); throws when the linear part is singular.</summary>
    public AffineTransform Inverse()
    {
        var inv = Linear.Inverse();
        return new AffineTransform(inv, -(inv * TranslationMm));
    }

    /// <summary>This transform applied after <paramref name="first"/>: x ↦ this(first(x)).</summary>
    public AffineTransform After(AffineTransform first) =>
        new(Linear * first.Linear, Linear * first.TranslationMm + TranslationMm);

    /// <summary>The 4x4 homogeneous matrix, row-major (16 numbers).</summary>
    public double[] ToMatrix4x4() =>
    [
        Linear.M00, Linear.M01, Linear.M02, TranslationMm.X,
        Linear.M10, Linear.M11, Linear.M12, TranslationMm.Y,
        Linear.M20, Linear.M21, Linear.M22, TranslationMm.Z,
        0, 0, 0, 1,
    ];

    /// <summary>Builds a transform from a 4x4 row-major matrix whose last row is (0, 0, 0, 1).</summary>
    public static AffineTransform FromMatrix4x4(IReadOnlyList<double> m)
    {
        if (m.Count != 16) throw new InvalidParameterException($"a 4x4 matrix needs 16 numbers, found {m.Count}", "transform matrix");
        if (Math.Abs(m[12]) > 1e-9 || Math.Abs(m[13]) > 1e-9 || Math.Abs(m[14]) > 1e-9 || Math.Abs(m[15] - 1) > 1e-9)
            throw new InvalidParameterException("the last row of an affine 4x4 matrix must be 0 0 0 1", "transform matrix");
        for (int i = 0; i < 12; i++)
            if (!double.IsFinite(m[i])) throw new InvalidParameterException("the transform matrix has a non-finite element", "transform matrix");
        return new AffineTransform(new Mat3(m[0], m[1], m[2], m[4], m[5], m[6], m[8], m[9], m[10]), new Vec3(m[3], m[7], m[11]));
    }
}
