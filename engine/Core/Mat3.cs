namespace Serimetry.Engine.Core;

/// <summary>An immutable 3x3 matrix of doubles, stored row-major.</summary>
public readonly struct Mat3 : IEquatable<Mat3>
{
    public readonly double M00, M01, M02, M10, M11, M12, M20, M21, M22;

    public Mat3(double m00, double m01, double m02, double m10, double m11, double m12, double m20, double m21, double m22)
    {
        M00 = m00; M01 = m01; M02 = m02;
        M10 = m10; M11 = m11; M12 = m12;
        M20 = m20; M21 = m21; M22 = m22;
    }

    public static readonly Mat3 Identity = new(1, 0, 0, 0, 1, 0, 0, 0, 1);

    /// <summary>Builds a matrix whose columns are the given vectors.</summary>
    public static Mat3 FromColumns(Vec3 c0, Vec3 c1, Vec3 c2) =>
        new(c0.X, c1.X, c2.X, c0.Y, c1.Y, c2.Y, c0.Z, c1.Z, c2.Z);

    /// <summary>Builds a matrix from 9 numbers in row-major order.</summary>
    public static Mat3 FromRowMajor(ReadOnlySpan<double> v)
    {
        if (v.Length != 9) throw new ArgumentException("A 3x3 matrix needs 9 numbers.", nameof(v));
        return new(v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7], v[8]);
    }

    public static Mat3 Diagonal(Vec3 d) => new(d.X, 0, 0, 0, d.Y, 0, 0, 0, d.Z);

    public Vec3 Column(int c) => c switch
    {
        0 => new Vec3(M00, M10, M20),
        1 => new Vec3(M01, M11, M21),
        2 => new Vec3(M02, M12, M22),
        _ => throw new ArgumentOutOfRangeException(nameof(c)),
    };

    public Vec3 Row(int r) => r switch
    {
        0 => new Vec3(M00, M01, M02),
        1 => new Vec3(M10, M11, M12),
        2 => new Vec3(M20, M21, M22),
        _ => throw new ArgumentOutOfRangeException(nameof(r)),
    };

    public double this[int r, int c] => Row(r)[c];

    public static Vec3 operator *(Mat3 m, Vec3 v) => new(
        m.M00 * v.X + m.M01 * v.Y + m.M02 * v.Z,
        m.M10 * v.X + m.M11 * v.Y + m.M12 * v.Z,
        m.M20 * v.X + m.M21 * v.Y + m.M22 * v.Z);

    public static Mat3 operator *(Mat3 a, Mat3 b) => FromColumns(a * b.Column(0), a * b.Column(1), a * b.Column(2));

    public Mat3 Transpose() => new(M00, M10, M20, M01, M11, M21, M02, M12, M22);

    public double Determinant =>
        M00 * (M11 * M22 - M12 * M21) - M01 * (M10 * M22 - M12 * M20) + M02 * (M10 * M21 - M11 * M20);

    /// <summary>The inverse; throws when the matrix is singular.</summary>
    public Mat3 Inverse()
    {
        double det = Determinant;
        if (det == 0 || !double.IsFinite(det)) throw new InvalidOperationException("Matrix is singular.");
        double inv = 1.0 / det;
        return new Mat3(
            (M11 * M22 - M12 * M21) * inv, (M02 * M21 - M01 * M22) * inv, (M01 * M12 - M02 * M11) * inv,
            (M12 * M20 - M10 * M22) * inv, (M00 * M22 - M02 * M20) * inv, (M02 * M10 - M00 * M12) * inv,
            (M10 * M21 - M11 * M20) * inv, (M01 * M20 - M00 * M21) * inv, (M00 * M11 - M01 * M10) * inv);
    }

    /// <summary>Largest absolute element-wise difference.</summary>
    public double MaxAbsDifference(Mat3 o)
    {
        double m = 0;
        ReadOnlySpan<double> a = [M00, M01, M02, M10, M11, M12, M20, M21, M22];
        ReadOnlySpan<double> b = [o.M00, o.M01, o.M02, o.M10, o.M11, o.M12, o.M20, o.M21, o.M22];
        for (int i = 0; i < 9; i++) m = Math.Max(m, Math.Abs(a[i] - b[i]));
        return m;
    }

    /// <summary>True when the columns are unit length and mutually orthogonal within <paramref name="tolerance"/>.</summary>
    public bool IsOrthonormal(double tolerance = 1e-4) => (Transpose() * this).MaxAbsDifference(Identity) <= tolerance;

    public double[] ToRowMajor() => [M00, M01, M02, M10, M11, M12, M20, M21, M22];

    public bool Equals(Mat3 other) => MaxAbsDifference(other) == 0;
    public override bool Equals(object? obj) => obj is Mat3 m && Equals(m);
    public override int GetHashCode() => HashCode.Combine(M00, M11, M22, M01, M12);
    public static bool operator ==(Mat3 a, Mat3 b) => a.Equals(b);
    public static bool operator !=(Mat3 a, Mat3 b) => !a.Equals(b);

    public override string ToString() => FormattableString.Invariant(
        $"[[{M00:G6}, {M01:G6}, {M02:G6}], [{M10:G6}, {M11:G6}, {M12:G6}], [{M20:G6}, {M21:G6}, {M22:G6}]]");
}
