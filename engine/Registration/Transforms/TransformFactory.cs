using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Metrics;

namespace Serimetry.Engine.Registration.Transforms;

/// <summary>Creates parametric transforms and their parameter scales.</summary>
internal static class TransformFactory
{
    /// <summary>
    /// A transform of <paramref name="kind"/> about <paramref name="centerMm"/> that starts as close to
    /// <paramref name="start"/> as the family allows (a translation keeps only the centre's displacement;
    /// a rigid transform takes the Euler angles of the linear part, which should be a rotation).
    /// </summary>
    public static IParametricTransform Create(TransformKind kind, Vec3 centerMm, AffineTransform start)
    {
        var t = start.TransformPoint(centerMm) - centerMm;
        return kind switch
        {
            TransformKind.Translation => new TranslationTransform(t),
            TransformKind.Rigid => new EulerRigidTransform(centerMm, EulerAngles(start.Linear), t),
            TransformKind.Affine => new CenteredAffineTransform(centerMm, start.Linear, t),
            _ => throw new ArgumentOutOfRangeException(nameof(kind)),
        };
    }

    /// <summary>Angles (θx, θy, θz) with R = Rz·Rx·Ry (the inverse of <see cref="EulerRigidTransform.RotationOf"/>).</summary>
    public static Vec3 EulerAngles(Mat3 r) =>
        new(Math.Asin(Math.Clamp(r.M21, -1, 1)), Math.Atan2(-r.M20, r.M22), Math.Atan2(-r.M01, r.M11));

    /// <summary>A transform of <paramref name="kind"/> about <paramref name="centerMm"/>, starting as a pure translation.</summary>
    public static IParametricTransform Create(TransformKind kind, Vec3 centerMm, Vec3 translationMm) => kind switch
    {
        TransformKind.Translation => new TranslationTransform(translationMm),
        TransformKind.Rigid => new EulerRigidTransform(centerMm, Vec3.Zero, translationMm),
        TransformKind.Affine => new CenteredAffineTransform(centerMm, Mat3.Identity, translationMm),
        _ => throw new ArgumentOutOfRangeException(nameof(kind)),
    };

    /// <summary>
    /// Per-parameter scales s_k = RMS over sample points of |∂T(x)/∂p_k| (mm per unit parameter), so that a
    /// unit step of the scaled parameter p_k·s_k moves points by about 1 mm whatever the parameter is
    /// (radians vs mm). The same idea as elastix's automatic scales estimation.
    /// </summary>
    public static double[] EstimateScales(IParametricTransform t, SampleSet samples, int maxPoints = 2000)
    {
        int p = t.ParameterCount;
        var sum = new double[p];
        Span<double> row = stackalloc double[p];
        int stride = Math.Max(1, samples.Count / maxPoints), used = 0;
        ReadOnlySpan<Vec3> axes = [new Vec3(1, 0, 0), new Vec3(0, 1, 0), new Vec3(0, 0, 1)];
        for (int i = 0; i < samples.Count; i += stride, used++)
        {
            var x = samples.Point(i);
            foreach (var axis in axes)
            {
                t.ProjectGradient(x, axis, row);
                for (int k = 0; k < p; k++) sum[k] += row[k] * row[k];
            }
        }
        var scales = new double[p];
        for (int k = 0; k < p; k++) scales[k] = Math.Max(1e-6, Math.Sqrt(sum[k] / Math.Max(1, used)));
        return scales;
    }
}
