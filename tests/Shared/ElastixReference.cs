using System.Diagnostics;
using System.Globalization;
using System.Text.RegularExpressions;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.MetaImage;

namespace Serimetry.Tests.Shared;

/// <summary>
/// Runs elastix (general-purpose registration toolbox, Debian package <c>elastix</c>) as the outside
/// reference for registration accuracy and speed: writes the images as MetaImage, runs a rigid
/// EulerTransform + AdvancedMattesMutualInformation registration with settings matched to ours, and reads
/// back TransformParameters.0.txt. elastix, like Serimetry, maps fixed points to moving points in physical
/// (LPS) space: T(x) = R(x − c) + c + t with R = Rz·Rx·Ry (ComputeZYX false).
/// </summary>
public static partial class ElastixReference
{
    public sealed record Schedule(int[] ShrinkPerLevel, int[] SamplesPerLevel, int Iterations, int Bins);

    public sealed record Outcome(AffineTransform Transform, double WallSeconds, string ParameterLine);

    public static bool Available => FindOnPath("elastix") is not null;

    /// <summary>Registers <paramref name="moving"/> to <paramref name="fixedImage"/>; the shrink schedule is per axis (x, y, z) per level.</summary>
    public static Outcome Run(Volume<float> fixedImage, Volume<float> moving, Volume<byte>? mask, Schedule s, string workDir, int threads = 0)
    {
        Directory.CreateDirectory(workDir);
        MetaImageWriter.Write(Path.Combine(workDir, "fixed.mhd"), fixedImage);
        MetaImageWriter.Write(Path.Combine(workDir, "moving.mhd"), moving);
        var args = new List<string> { "-f", "fixed.mhd", "-m", "moving.mhd", "-p", "params.txt", "-out", "out" };
        if (mask is not null)
        {
            MetaImageWriter.Write(Path.Combine(workDir, "mask.mhd"), mask);
            args.AddRange(["-fMask", "mask.mhd"]);
        }
        if (threads > 0) args.AddRange(["-threads", threads.ToString(CultureInfo.InvariantCulture)]);
        File.WriteAllText(Path.Combine(workDir, "params.txt"), Parameters(s));
        Directory.CreateDirectory(Path.Combine(workDir, "out"));
        var tp = Path.Combine(workDir, "out", "TransformParameters.0.txt");
        double seconds = RunElastix(workDir, args, tp);
        var text = File.ReadAllText(tp);
        return new Outcome(ParseEuler(text), seconds, Field(text, "TransformParameters"));
    }

    /// <summary>
    /// Runs elastix in <paramref name="workDir"/> (at most ten minutes) and returns its wall time in seconds; a non-zero
    /// exit or a missing <paramref name="lastOutput"/> file is an error carrying stderr and the tail of stdout.
    /// </summary>
    internal static double RunElastix(string workDir, IEnumerable<string> args, string lastOutput)
    {
        var clock = Stopwatch.StartNew();
        var (exitCode, stdout, stderr) = ToolProcess.Run(ToolProcess.StartInfo("elastix", args, workDir), TimeSpan.FromMinutes(10));
        double seconds = clock.Elapsed.TotalSeconds;
        if (exitCode != 0 || !File.Exists(lastOutput))
            throw new InvalidOperationException($"elastix failed ({exitCode}): {stderr}\n{Tail(stdout)}");
        return seconds;
    }

    /// <summary>Reads EulerTransform parameters and centre of rotation into an affine map.</summary>
    public static AffineTransform ParseEuler(string transformParameters)
    {
        var p = Numbers(Field(transformParameters, "TransformParameters"));
        var c = Numbers(Field(transformParameters, "CenterOfRotationPoint"));
        bool zyx = Field(transformParameters, "ComputeZYX", "\"false\"").Contains("true", StringComparison.Ordinal);
        double cx = Math.Cos(p[0]), sx = Math.Sin(p[0]), cy = Math.Cos(p[1]), sy = Math.Sin(p[1]), cz = Math.Cos(p[2]), sz = Math.Sin(p[2]);
        var rx = new Mat3(1, 0, 0, 0, cx, -sx, 0, sx, cx);
        var ry = new Mat3(cy, 0, sy, 0, 1, 0, -sy, 0, cy);
        var rz = new Mat3(cz, -sz, 0, sz, cz, 0, 0, 0, 1);
        var r = zyx ? rz * ry * rx : rz * rx * ry;
        var center = new Vec3(c[0], c[1], c[2]);
        var t = new Vec3(p[3], p[4], p[5]);
        return new AffineTransform(r, center + t - r * center);
    }

    /// <summary>
    /// Parameter-file entries every Serimetry-vs-elastix comparison shares: float images in 3D with direction
    /// cosines, linear interpolation, recursive pyramids, Mattes mutual information composed with earlier
    /// transforms, adaptive stochastic gradient descent on fresh random samples each iteration, no result image.
    /// </summary>
    internal const string CommonSettings = """
        (FixedInternalImagePixelType "float")
        (MovingInternalImagePixelType "float")
        (FixedImageDimension 3)
        (MovingImageDimension 3)
        (UseDirectionCosines "true")
        (Registration "MultiResolutionRegistration")
        (Interpolator "LinearInterpolator")
        (ResampleInterpolator "FinalBSplineInterpolator")
        (FinalBSplineInterpolationOrder 1)
        (Resampler "DefaultResampler")
        (FixedImagePyramid "FixedRecursiveImagePyramid")
        (MovingImagePyramid "MovingRecursiveImagePyramid")
        (Optimizer "AdaptiveStochasticGradientDescent")
        (Metric "AdvancedMattesMutualInformation")
        (HowToCombineTransforms "Compose")
        (ErodeMask "false")
        (NewSamplesEveryIteration "true")
        (ImageSampler "RandomCoordinate")
        (CheckNumberOfSamples "false")
        (DefaultPixelValue 0)
        (WriteResultImage "false")
        (WriteIterationInfo "false")

        """;

    private static string Parameters(Schedule s)
    {
        var ci = CultureInfo.InvariantCulture;
        string schedule = string.Join(" ", s.ShrinkPerLevel.Select(v => v.ToString(ci)));
        string samples = string.Join(" ", s.SamplesPerLevel.Select(v => v.ToString(ci)));
        return CommonSettings + $"""
            (Transform "EulerTransform")
            (AutomaticScalesEstimation "true")
            (AutomaticTransformInitialization "true")
            (AutomaticTransformInitializationMethod "GeometricalCenter")
            (NumberOfHistogramBins {s.Bins})
            (NumberOfResolutions {s.SamplesPerLevel.Length})
            (ImagePyramidSchedule {schedule})
            (MaximumNumberOfIterations {s.Iterations})
            (NumberOfSpatialSamples {samples})
            (ResultImageFormat "mhd")
            """;
    }

    /// <summary>The value of a <c>(Name value…)</c> entry of an elastix parameter or result file.</summary>
    internal static string Field(string text, string name, string? fallback = null)
    {
        var m = Regex.Match(text, @"\(" + name + @"\s+([^)]*)\)");
        if (m.Success) return m.Groups[1].Value;
        return fallback ?? throw new InvalidOperationException($"elastix output lacks {name}");
    }

    /// <summary>Space-separated numbers of an elastix entry.</summary>
    internal static double[] Numbers(string s) =>
        s.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray();

    private static string Tail(string s) => s.Length > 2000 ? s[^2000..] : s;

    private static string? FindOnPath(string exe) =>
        (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':').Select(d => Path.Combine(d, exe)).FirstOrDefault(File.Exists);
}
