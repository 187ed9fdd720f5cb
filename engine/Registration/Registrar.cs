using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Deformable;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Optimizers;
using Serimetry.Engine.Registration.Pyramid;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration;

/// <summary>
/// The one-call registration facade: transform, metric, linear interpolator, optimizer and
/// multi-resolution driver composed as the options say (the decomposition of ITK's registration framework).
/// </summary>
public static class Registrar
{
    /// <summary>|absorbed change − 1| above which the result carries a warning (common practice: 10 %, a typical volume repeatability).</summary>
    private const double AbsorbedChangeWarning = 0.10;

    /// <summary>
    /// Estimates the transform mapping fixed-image points (LPS mm) to moving-image points. Throws
    /// <see cref="RegistrationException"/> for inputs that cannot be registered (constant image, empty mask,
    /// no overlap), <see cref="GeometryMismatchException"/> when the mask is not on the fixed grid and
    /// <see cref="InvalidParameterException"/> for bad options; everything else comes back as data.
    /// Samples count only where the fixed mask is set and, when <paramref name="movingMask"/> is given, where
    /// they land inside it. <paramref name="lesionMask"/> (fixed grid) matters only to a B-spline stage: it keeps
    /// the deformation from absorbing the lesion's change (<see cref="BSplineStageOptions.ProtectLesion"/>) and
    /// is where <see cref="RegistrationResult.AbsorbedChange"/> is measured.
    /// </summary>
    public static RegistrationResult Register(Volume<float> fixedImage, Volume<float> moving, RegistrationOptions options,
        Volume<byte>? fixedMask = null, IProgress<RegistrationProgress>? progress = null, Volume<byte>? movingMask = null,
        Volume<byte>? lesionMask = null)
    {
        ArgumentNullException.ThrowIfNull(fixedImage);
        ArgumentNullException.ThrowIfNull(moving);
        ArgumentNullException.ThrowIfNull(options);
        Validate(options);
        var clock = Stopwatch.StartNew();
        var deadline = DateTime.UtcNow + options.TimeLimit;
        var warnings = new List<string>();
        var f = RegistrationInputs.Sanitize(fixedImage, "fixed", warnings);
        var m = RegistrationInputs.Sanitize(moving, "moving", warnings);
        var mask = RegistrationInputs.PrepareMask(fixedMask, f.Geometry, options.MaskDilationMm);
        var mMask = RegistrationInputs.PrepareMask(movingMask, m.Geometry, options.MaskDilationMm, "moving");
        var lesion = RegistrationInputs.PrepareLesion(lesionMask, f.Geometry);
        var fField = options.CorrectBias ? BiasFieldCorrection.Estimate(f) : null;
        var mField = options.CorrectBias ? BiasFieldCorrection.Estimate(m) : null;
        var center = TransformInitializer.RotationCenter(f, mask);
        var transform = TransformFactory.Create(options.Transform, center, TransformInitializer.Start(options.Initialization, f, m));
        RegistrationInputs.RequireOverlap(f, mask, m, transform.ToAffine());
        (f, mask, m, mMask) = RegistrationInputs.CropToMask(f, mask, m, mMask, transform.ToAffine());
        if (fField is not null) f = BiasFieldCorrection.Apply(f, fField, options.MaxThreads);
        if (mField is not null) m = BiasFieldCorrection.Apply(m, mField, options.MaxThreads);
        var searchOrigin = transform.TransformPoint(center);

        double finest = Math.Min(f.Geometry.SpacingMm.X, Math.Min(f.Geometry.SpacingMm.Y, f.Geometry.SpacingMm.Z));
        var reports = new List<LevelReport>();
        ImageMetric? metric = null;
        for (int li = 0; li < options.Levels.Count; li++)
        {
            var level = options.Levels[li];
            var images = ResolutionLevel.Build(f, mask, m, level.ShrinkFactor, level.SmoothingSigmaMm, finest, options.MaxThreads, mMask);
            int seed = level.Seed ?? options.Seed + li;
            metric = CreateMetric(options, images, level.Samples, seed);
            var report = RunLevel(li, level, images, metric, transform, options, deadline, progress, seed, (center, searchOrigin));
            if (report.StopReason == StopReason.MetricNotFinite)
                warnings.Add($"level {li}: too few samples overlap the moving image; the level was skipped");
            reports.Add(report);
        }
        var result = Summarise(transform, metric!, reports, options, warnings, center, clock.Elapsed.TotalSeconds);
        if (options.BSpline is not { } bspline) return result;
        var croppedLesion = lesion is null ? null : MaskOperations.CropTo(lesion, f.Geometry);
        var (deformation, deformReports, deformMetric) = DeformableStage.Run(f, mask, m, result.Transform, bspline, options, deadline, warnings,
            progress, croppedLesion);
        double? absorbed = lesion is null ? null : JacobianVolume.AbsorbedChange(deformation, lesion);
        if (absorbed is { } a && Math.Abs(a - 1) > AbsorbedChangeWarning)
            warnings.Add(string.Create(CultureInfo.InvariantCulture,
                $"the deformation changes the lesion's volume by a factor {a:F2}; lesion change measured through it is understated by that factor"));
        return result with
        {
            Deformation = deformation,
            DeformationMetricName = deformMetric,
            AbsorbedChange = absorbed,
            DeformationLevels = deformReports,
            TransformType = "bspline",
            Warnings = warnings.ToArray(),
            ElapsedSeconds = clock.Elapsed.TotalSeconds,
        };
    }

    private static LevelReport RunLevel(int li, RegistrationLevel level, ResolutionLevel images, ImageMetric metric,
        IParametricTransform transform, RegistrationOptions options, DateTime deadline,
        IProgress<RegistrationProgress>? progress, int seed, (Vec3 Center, Vec3 Start) search)
    {
        var clock = Stopwatch.StartNew();
        int p = transform.ParameterCount;
        var scales = TransformFactory.EstimateScales(transform, metric.Samples);
        var start = new double[p];
        transform.GetParameters(start);
        for (int k = 0; k < p; k++) start[k] *= scales[k];
        var raw = new double[p];
        var gRaw = new double[p];
        double Objective(ReadOnlySpan<double> q, Span<double> g)
        {
            for (int k = 0; k < p; k++) raw[k] = q[k] / scales[k];
            transform.SetParameters(raw);
            if (OutOfRange(transform, options, search)) return double.NaN;
            double v = metric.Evaluate(transform, gRaw);
            for (int k = 0; k < p; k++) g[k] = gRaw[k] / scales[k];
            return v;
        }
        double startValue = metric.Evaluate(transform, gRaw);
        var settings = new OptimizerSettings(level.MaxIterations, level.MaxStepMm, level.MinStepMm, DeadlineUtc: deadline);
        Action<int, double>? onIteration = progress is null ? null : (it, v) => progress.Report(new(li, options.Levels.Count, it, v));
        var outcome = options.Optimizer == OptimizerKind.Lbfgs
            ? LbfgsOptimizer.Minimize(Objective, start, settings, onIteration)
            : RegularStepGradientDescent.Minimize(Objective, start, settings, onIteration);
        for (int k = 0; k < p; k++) raw[k] = outcome.Parameters[k] / scales[k];
        transform.SetParameters(raw);
        return new LevelReport(li, images.FixedShrink, images.MovingShrink, images.FixedSigmaMm, metric.Samples.Count, seed,
            outcome.Iterations, outcome.StopReason, startValue, outcome.Value, clock.Elapsed.TotalSeconds);
    }

    /// <summary>Whether the transform moves the rotation centre beyond the search range.</summary>
    private static bool OutOfRange(IParametricTransform t, RegistrationOptions o, (Vec3 Center, Vec3 Start) search) =>
        o.MaxCenterDisplacementMm is { } limit && (t.TransformPoint(search.Center) - search.Start).Norm > limit;

    private static ImageMetric CreateMetric(RegistrationOptions o, ResolutionLevel images, int samples, int seed)
    {
        var set = SampleSet.Draw(images.Fixed, images.Mask, samples, seed);
        var interp = new LinearInterpolator(images.Moving);
        var lookup = images.MovingMask is null ? null : new MaskLookup(images.MovingMask);
        return o.Metric switch
        {
            MetricKind.MattesMutualInformation => new MattesMutualInformationMetric(set, interp, o.MaxThreads, o.HistogramBins,
                Range(set.FixedValues), Range(images.Moving.Voxels)) { MovingMask = lookup },
            MetricKind.Correlation => new CorrelationMetric(set, interp, o.MaxThreads) { MovingMask = lookup },
            MetricKind.MeanSquares => new MeanSquaresMetric(set, interp, o.MaxThreads) { MovingMask = lookup },
            _ => throw new ArgumentOutOfRangeException(nameof(o)),
        };
    }

    /// <summary>Smallest and largest value (the histogram range of the Mattes MI metrics).</summary>
    internal static (double Min, double Max) Range(float[] v)
    {
        float min = float.PositiveInfinity, max = float.NegativeInfinity;
        foreach (var x in v) { if (x < min) min = x; if (x > max) max = x; }
        return (min, max);
    }

    private static RegistrationResult Summarise(IParametricTransform transform, ImageMetric metric, List<LevelReport> reports,
        RegistrationOptions options, List<string> warnings, Vec3 center, double elapsed)
    {
        var parameters = new double[transform.ParameterCount];
        transform.GetParameters(parameters);
        double after = metric.Evaluate(transform, default);
        var identity = TransformFactory.Create(options.Transform, center, Vec3.Zero);
        double before = metric.Evaluate(identity, default);
        var affine = transform.ToAffine();
        double rotation = RegistrationQuality.RotationDegrees(affine.Linear);
        double shift = (affine.TransformPoint(center) - center).Norm;
        RegistrationQuality.AddWarnings(warnings, options, rotation, shift, before, after);
        if (reports.Exists(r => r.StopReason == StopReason.TimeLimit))
            warnings.Add("the time limit was reached before the optimisation finished");
        return new RegistrationResult(affine, transform.Kind, metric.Name, before, after, reports, reports[^1].StopReason,
            warnings, options, parameters, transform.ParameterNames, center, rotation, shift, elapsed);
    }

    private static void Validate(RegistrationOptions o)
    {
        if (o.Levels.Count == 0) throw new InvalidParameterException("the schedule has no level", "registration levels", "give at least one level");
        foreach (var l in o.Levels)
        {
            if (!(l.ShrinkFactor >= 1) || l.MaxIterations < 0 || !(l.MaxStepMm > 0) || !(l.MinStepMm > 0) || l.Samples < 0)
                throw new InvalidParameterException($"invalid level {l}", "registration levels",
                    "shrink factor ≥ 1, iterations ≥ 0, samples ≥ 0, positive step lengths");
        }
        if (o.HistogramBins is < 8 or > 512)
            throw new InvalidParameterException($"histogram bins {o.HistogramBins} outside 8–512", "histogram bins");
        if (o.BSpline is { } b && (!(b.GridSpacingMm > 0) || !(b.BendingWeightMm2 >= 0) || b.Levels.Count == 0
            || !(b.FoldingPenaltyWeight >= 0) || !double.IsFinite(b.MinJacobian) || !(b.LesionMarginMm >= 0)
            || !(b.LesionJacobianWeight >= 0) || b.Metric == MetricKind.Correlation))
            throw new InvalidParameterException("invalid B-spline stage settings", "bspline",
                "positive grid spacing, non-negative bending, folding and lesion weights and margin, a finite minimum Jacobian, "
                + "at least one level, metric mean squares or Mattes MI");
        if (o.TimeLimit <= TimeSpan.Zero) throw new InvalidParameterException("the time limit must be positive", "time limit");
    }
}
