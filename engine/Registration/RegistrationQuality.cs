using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration;

/// <summary>Plausibility figures and warnings for a finished registration.</summary>
internal static class RegistrationQuality
{
    /// <summary>Rotation angle (degrees) of the orthonormal part of the linear map (Gram–Schmidt on its columns).</summary>
    public static double RotationDegrees(Mat3 linear)
    {
        if (!(Math.Abs(linear.Determinant) > 1e-12)) return double.NaN;
        var c0 = linear.Column(0).Normalized();
        var c1 = linear.Column(1) - c0.Dot(linear.Column(1)) * c0;
        c1 = c1.Normalized();
        var c2 = c0.Cross(c1);
        var r = Mat3.FromColumns(c0, c1, c2);
        double cos = Math.Clamp((r.M00 + r.M11 + r.M22 - 1) / 2, -1, 1);
        return Math.Acos(cos) * 180 / Math.PI;
    }

    public static void AddWarnings(List<string> warnings, RegistrationOptions o, double rotationDeg, double shiftMm,
        double before, double after)
    {
        var ci = CultureInfo.InvariantCulture;
        if (double.IsNaN(rotationDeg))
            warnings.Add("the estimated linear map is singular: the registration failed");
        if (rotationDeg > o.WarnRotationDeg)
            warnings.Add(string.Create(ci, $"rotation {rotationDeg:F1}° exceeds {o.WarnRotationDeg:G}°: check the alignment visually"));
        if (shiftMm > o.WarnShiftMm)
            warnings.Add(string.Create(ci, $"shift {shiftMm:F1} mm at the rotation centre exceeds {o.WarnShiftMm:G} mm: check the alignment visually"));
        if (double.IsFinite(before) && double.IsFinite(after) && after > before)
            warnings.Add(string.Create(ci, $"metric after registration ({after:G6}) is worse than at identity ({before:G6})"));
        if (!double.IsFinite(after))
            warnings.Add("the metric could not be evaluated at the result (too little overlap)");
    }
}
