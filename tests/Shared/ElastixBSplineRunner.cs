using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.MetaImage;
using Serimetry.Engine.Registration.Transforms;
namespace Serimetry.Tests.Shared;

/// <summary>
/// Runs elastix (general-purpose registration toolbox, Debian package <c>elastix</c>) with two parameter
/// files — EulerTransform then BSplineTransform, both AdvancedMattesMutualInformation — and reads the
/// result back as a map. elastix composes the stages as T(x) = T_bspline(T_euler(x)) (AdvancedCombinationTransform,
/// "Compose"), and its B-spline is x + Σ c_k β³((x − GridOrigin)/GridSpacing − k), the same cubic kernel and
/// support as ours, so its coefficients load into a <see cref="BSplineDeformation"/> with an identity bulk.
/// </summary>
internal static partial class ElastixBSplineRunner
{
    public sealed record Outcome(ISpatialTransform Transform, double WallSeconds);

    /// <summary>
    /// Runs both stages; <paramref name="rigidSamples"/>/<paramref name="bsplineSamples"/> are elastix's
    /// NumberOfSpatialSamples (one value, or one per level) and the iteration counts its MaximumNumberOfIterations.
    /// </summary>
    public static Outcome Run(Volume<float> fixedImage, Volume<float> moving, Volume<byte> mask, string rigidSchedule, string bsplineSchedule,
        double gridSpacingMm, string workDir, string rigidSamples = "4000", string bsplineSamples = "10000", int rigidIterations = 200,
        int bsplineIterations = 200)
    {
        Directory.CreateDirectory(workDir);
        Directory.CreateDirectory(Path.Combine(workDir, "out"));
        MetaImageWriter.Write(Path.Combine(workDir, "fixed.mhd"), fixedImage);
        MetaImageWriter.Write(Path.Combine(workDir, "moving.mhd"), moving);
        MetaImageWriter.Write(Path.Combine(workDir, "mask.mhd"), mask);
        File.WriteAllText(Path.Combine(workDir, "rigid.txt"), Common(rigidSchedule, rigidSamples, rigidIterations) + """
            (Transform "EulerTransform")
            (AutomaticScalesEstimation "true")
            (AutomaticTransformInitialization "true")
            (AutomaticTransformInitializationMethod "GeometricalCenter")
            """);
        File.WriteAllText(Path.Combine(workDir, "bspline.txt"), Common(bsplineSchedule, bsplineSamples, bsplineIterations) + string.Create(CultureInfo.InvariantCulture, $"""
            (Transform "BSplineTransform")
            (BSplineTransformSplineOrder 3)
            (FinalGridSpacingInPhysicalUnits {gridSpacingMm})
            (GridSpacingSchedule 1.0 1.0)
            """));
        var tp0 = Path.Combine(workDir, "out", "TransformParameters.0.txt");
        var tp1 = Path.Combine(workDir, "out", "TransformParameters.1.txt");
        double seconds = ElastixReference.RunElastix(workDir,
            ["-f", "fixed.mhd", "-m", "moving.mhd", "-fMask", "mask.mhd", "-p", "rigid.txt", "-p", "bspline.txt", "-out", "out"], tp1);
        var rigid = ElastixReference.ParseEuler(File.ReadAllText(tp0));
        var bspline = ParseBSpline(File.ReadAllText(tp1));
        return new Outcome(new Composed(rigid, bspline), seconds);
    }

    private sealed record Composed(AffineTransform First, BSplineDeformation Then) : ISpatialTransform
    {
        public Vec3 TransformPoint(Vec3 fixedPointMm) => Then.TransformPoint(First.TransformPoint(fixedPointMm));
    }

    private static BSplineDeformation ParseBSpline(string text)
    {
        var size = Numbers(Field(text, "GridSize"));
        var index = Numbers(Field(text, "GridIndex"));
        var spacing = Numbers(Field(text, "GridSpacing"));
        var origin = Numbers(Field(text, "GridOrigin"));
        var direction = Numbers(Field(text, "GridDirection"));
        if (index.Any(v => v != 0)) throw new InvalidOperationException("non-zero GridIndex is not handled");
        // Assumed column by column; the test grids are axial (identity), where the order does not matter.
        var dir = new Mat3(direction[0], direction[3], direction[6], direction[1], direction[4], direction[7], direction[2], direction[5], direction[8]);
        return new BSplineDeformation(AffineTransform.Identity, new Vec3(origin[0], origin[1], origin[2]), new Vec3(spacing[0], spacing[1], spacing[2]),
            new Size3((int)size[0], (int)size[1], (int)size[2]), dir, Numbers(Field(text, "TransformParameters")));
    }

    private static string Common(string schedule, string samples, int iterations) => ElastixReference.CommonSettings + $"""
        (NumberOfHistogramBins 32)
        (NumberOfResolutions {schedule.Split(' ', StringSplitOptions.RemoveEmptyEntries).Length / 3})
        (ImagePyramidSchedule {schedule})
        (MaximumNumberOfIterations {iterations})
        (NumberOfSpatialSamples {samples})

        """;

    private static string Field(string text, string name) => ElastixReference.Field(text, name);

    private static double[] Numbers(string s) => ElastixReference.Numbers(s);
}
