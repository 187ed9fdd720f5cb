using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Converts between the NIfTI voxel-to-world mapping (RAS+, nifti1.h "methods" 1-3) and the engine's
/// <see cref="Geometry"/> (DICOM LPS+). The two worlds differ by the sign of x and y:
/// A_LPS = diag(−1,−1,1)·A_RAS (facts.md §10). Precedence follows nifti1.h: the sform (method 3) when
/// <c>sform_code</c> &gt; 0, else the qform (method 2) when <c>qform_code</c> &gt; 0, else pixdim alone (method 1).
/// </summary>
internal static class NiftiOrientation
{
    /// <summary>Deviation from orthonormal direction columns above which a warning is recorded.</summary>
    public const double ShearWarningTolerance = 1e-4;

    /// <summary>Flips RAS to LPS (its own inverse).</summary>
    private static readonly Mat3 Flip = Mat3.Diagonal(new Vec3(-1, -1, 1));

    /// <summary>The engine geometry of a header's grid, with the source used ("sform", "qform", "pixdim").</summary>
    public static (Geometry Geometry, string Source) ToGeometry(NiftiHeader h, Size3 size, List<string> warnings, string where)
    {
        (Mat3 M, Vec3 T) ras;
        string source;
        if (h.SformCode > 0)
        {
            ras = SformAffine(h, where);
            source = "sform";
            if (h.QformCode > 0) WarnWhenDisagreeing(ras, QformAffine(h, where), size, warnings);
        }
        else if (h.QformCode > 0)
        {
            ras = QformAffine(h, where);
            source = "qform";
        }
        else
        {
            ras = (Mat3.Diagonal(new Vec3(PixDim(h, 1, where), PixDim(h, 2, where), PixDim(h, 3, where))), Vec3.Zero);
            source = "pixdim";
            warnings.Add("qform_code and sform_code are both 0: orientation unknown, voxel axes taken as RAS with pixdim spacing (nifti1.h method 1)");
        }
        double unit = h.SpatialUnitToMm;
        var lpsM = Flip * ras.M * Mat3.Diagonal(new Vec3(unit, unit, unit));
        var lpsT = Flip * ras.T * unit;
        return (FromAffine(lpsM, lpsT, size, source, warnings, where), source);
    }

    /// <summary>nifti1.h method 3: the sform rows srow_x/y/z.</summary>
    public static (Mat3 M, Vec3 T) SformAffine(NiftiHeader h, string where)
    {
        var m = new Mat3(h.SrowX[0], h.SrowX[1], h.SrowX[2], h.SrowY[0], h.SrowY[1], h.SrowY[2], h.SrowZ[0], h.SrowZ[1], h.SrowZ[2]);
        var t = new Vec3(h.SrowX[3], h.SrowY[3], h.SrowZ[3]);
        if (!IsFinite(m) || !t.IsFinite)
            throw new InputFormatException("the sform (srow_x/y/z) holds a non-finite number", where, "repair the header or set sform_code to 0");
        return (m, t);
    }

    /// <summary>
    /// nifti1.h method 2: R(quaternion b,c,d with a = sqrt(1−b²−c²−d²)) · diag(pixdim1, pixdim2, qfac·pixdim3),
    /// offset (qoffset_x, y, z); qfac = pixdim[0] (−1 flips the third axis, anything else counts as +1).
    /// </summary>
    public static (Mat3 M, Vec3 T) QformAffine(NiftiHeader h, string where)
    {
        double b = h.QuaternB, c = h.QuaternC, d = h.QuaternD;
        double aa = 1.0 - (b * b + c * c + d * d);
        double a;
        if (aa < 1e-7)
        {
            // b,c,d describe (nearly) a 180° rotation: a = 0 and (b,c,d) renormalised, as nifti1.h describes.
            double n = Math.Sqrt(b * b + c * c + d * d);
            if (n == 0 || !double.IsFinite(n)) throw new InputFormatException("the qform quaternion is not finite", where);
            a = 0; b /= n; c /= n; d /= n;
        }
        else
        {
            a = Math.Sqrt(aa);
        }
        var r = QuaternionToMatrix(a, b, c, d);
        double qfac = h.PixDim[0] < 0 ? -1 : 1;
        var scale = new Vec3(PixDim(h, 1, where), PixDim(h, 2, where), qfac * PixDim(h, 3, where));
        var t = new Vec3(h.QoffsetX, h.QoffsetY, h.QoffsetZ);
        if (!t.IsFinite) throw new InputFormatException("qoffset_x/y/z holds a non-finite number", where);
        return (r * Mat3.Diagonal(scale), t);
    }

    /// <summary>The rotation matrix of a unit quaternion (a, b, c, d) (nifti1.h, method 2 formula).</summary>
    public static Mat3 QuaternionToMatrix(double a, double b, double c, double d) => new(
        a * a + b * b - c * c - d * d, 2 * (b * c - a * d), 2 * (b * d + a * c),
        2 * (b * c + a * d), a * a + c * c - b * b - d * d, 2 * (c * d - a * b),
        2 * (b * d - a * c), 2 * (c * d + a * b), a * a + d * d - c * c - b * b);

    /// <summary>
    /// The unit quaternion (a ≥ 0, b, c, d) of a proper rotation, choosing the numerically largest
    /// component first (Shepperd's method, J. Guidance Control 1978).
    /// </summary>
    public static (double A, double B, double C, double D) MatrixToQuaternion(Mat3 r)
    {
        double tr = r.M00 + r.M11 + r.M22;
        double a, b, c, d;
        if (tr > 0)
        {
            a = 0.5 * Math.Sqrt(1 + tr);
            b = (r.M21 - r.M12) / (4 * a); c = (r.M02 - r.M20) / (4 * a); d = (r.M10 - r.M01) / (4 * a);
        }
        else if (r.M00 >= r.M11 && r.M00 >= r.M22)
        {
            b = 0.5 * Math.Sqrt(1 + r.M00 - r.M11 - r.M22);
            a = (r.M21 - r.M12) / (4 * b); c = (r.M01 + r.M10) / (4 * b); d = (r.M02 + r.M20) / (4 * b);
        }
        else if (r.M11 >= r.M22)
        {
            c = 0.5 * Math.Sqrt(1 + r.M11 - r.M00 - r.M22);
            a = (r.M02 - r.M20) / (4 * c); b = (r.M01 + r.M10) / (4 * c); d = (r.M12 + r.M21) / (4 * c);
        }
        else
        {
            d = 0.5 * Math.Sqrt(1 + r.M22 - r.M00 - r.M11);
            a = (r.M10 - r.M01) / (4 * d); b = (r.M02 + r.M20) / (4 * d); c = (r.M12 + r.M21) / (4 * d);
        }
        return a < 0 ? (-a, -b, -c, -d) : (a, b, c, d);
    }

    /// <summary>The RAS sform (3x3 linear part, offset) of an engine geometry.</summary>
    public static (Mat3 M, Vec3 T) ToRasAffine(Geometry g) => (Flip * g.IndexToPhysicalMatrix, Flip * g.OriginMm);

    /// <summary>The qform of an engine geometry: quaternion of the proper rotation, qfac, and RAS offset.</summary>
    public static (double B, double C, double D, double Qfac, Vec3 OffsetRas) ToQform(Geometry g)
    {
        var r = Flip * Orthonormalize(g.Direction);
        double qfac = 1;
        if (r.Determinant < 0)
        {
            // A left-handed grid: nifti1.h stores it as a proper rotation with the third axis flipped (qfac = −1).
            r = r * Mat3.Diagonal(new Vec3(1, 1, -1));
            qfac = -1;
        }
        var (_, b, c, d) = MatrixToQuaternion(r);
        return (b, c, d, qfac, Flip * g.OriginMm);
    }

    /// <summary>
    /// The nearest orthogonal matrix (polar decomposition, Higham's iteration X ← (X + X⁻ᵀ)/2; N. J. Higham,
    /// SIAM J. Sci. Stat. Comput. 1986). Keeps the sign of the determinant.
    /// </summary>
    public static Mat3 Orthonormalize(Mat3 m)
    {
        var x = m;
        for (int it = 0; it < 100; it++)
        {
            var inv = x.Inverse().Transpose();
            var next = new Mat3(
                0.5 * (x.M00 + inv.M00), 0.5 * (x.M01 + inv.M01), 0.5 * (x.M02 + inv.M02),
                0.5 * (x.M10 + inv.M10), 0.5 * (x.M11 + inv.M11), 0.5 * (x.M12 + inv.M12),
                0.5 * (x.M20 + inv.M20), 0.5 * (x.M21 + inv.M21), 0.5 * (x.M22 + inv.M22));
            double change = next.MaxAbsDifference(x);
            x = next;
            if (change < 1e-15) break;
        }
        return x;
    }

    private static Geometry FromAffine(Mat3 m, Vec3 t, Size3 size, string source, List<string> warnings, string where)
    {
        var spacing = new Vec3(m.Column(0).Norm, m.Column(1).Norm, m.Column(2).Norm);
        if (!(spacing.X > 0 && spacing.Y > 0 && spacing.Z > 0) || !spacing.IsFinite)
            throw new InputFormatException(
                $"the {source} gives a zero or non-finite voxel size {spacing}", where,
                $"repair the {source} (or pixdim) so that every voxel axis has a positive length");
        var dir = Mat3.FromColumns(m.Column(0) / spacing.X, m.Column(1) / spacing.Y, m.Column(2) / spacing.Z);
        if (Math.Abs(dir.Determinant) < 1e-6)
            throw new InputFormatException($"the {source} is singular (voxel axes are parallel)", where, $"repair the {source}");
        double shear = (dir.Transpose() * dir).MaxAbsDifference(Mat3.Identity);
        var rot = Orthonormalize(dir);
        if (shear > ShearWarningTolerance)
        {
            double degrees = Math.Asin(Math.Min(1, shear)) * 180 / Math.PI;
            warnings.Add(string.Create(CultureInfo.InvariantCulture,
                $"the {source} is not orthogonal (axes off by up to {degrees:F3} degrees): replaced by the nearest rotation with the same voxel sizes; positions far from the origin may move"));
        }
        return new Geometry(size, spacing, t, rot);
    }

    private static void WarnWhenDisagreeing((Mat3 M, Vec3 T) s, (Mat3 M, Vec3 T) q, Size3 size, List<string> warnings)
    {
        double worst = 0;
        for (int corner = 0; corner < 8; corner++)
        {
            var idx = new Vec3((corner & 1) * (size.X - 1), ((corner >> 1) & 1) * (size.Y - 1), ((corner >> 2) & 1) * (size.Z - 1));
            worst = Math.Max(worst, ((s.M * idx + s.T) - (q.M * idx + q.T)).Norm);
        }
        if (worst > 0.01)
            warnings.Add(string.Create(CultureInfo.InvariantCulture,
                $"qform and sform disagree by up to {worst:G4} mm at the grid corners; the sform is used (nifti1.h: sform_code > 0 takes precedence)"));
    }

    private static double PixDim(NiftiHeader h, int axis, string where)
    {
        double v = h.PixDim[axis];
        if (!(v > 0) || !double.IsFinite(v))
            throw new InputFormatException(
                string.Create(CultureInfo.InvariantCulture, $"pixdim[{axis}] is {v}; a voxel size must be positive"), where,
                "repair pixdim in the header");
        return v;
    }

    private static bool IsFinite(Mat3 m)
    {
        foreach (var v in m.ToRowMajor()) if (!double.IsFinite(v)) return false;
        return true;
    }
}
