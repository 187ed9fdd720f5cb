using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Registration.Interpolation;
using Serimetry.Engine.Registration.Metrics;
using Serimetry.Engine.Registration.Optimizers;
using Serimetry.Engine.Registration.Pyramid;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration.Deformable;

/// <summary>
/// The B-spline stage: starts from the bulk affine result with zero displacement and minimises the metric
/// (normalised mean squares or Mattes MI) + bending energy (+ folding guard, + optional lesion term) with L-BFGS
/// over the coefficients, level by level on the registration pyramid, the control grid covering the (cropped)
/// fixed domain; a lesion mask leaves the samples (grown by a margin) so lesion change is not absorbed.
/// </summary>
internal static class DeformableStage
{
    /// <summary>
    /// Runs the stage. <paramref name="lesion"/> (on <paramref name="f"/>'s grid, or null): with
    /// <see cref="BSplineStageOptions.ProtectLesion"/> its grown region leaves the samples and its volume is kept.
    /// </summary>
    public static (BSplineDeformation Deformation, List<LevelReport> Reports, string MetricName) Run(Volume<float> f, Volume<byte>? mask,
        Volume<float> m, AffineTransform bulk, BSplineStageOptions b, RegistrationOptions o, DateTime deadline,
        List<string> warnings, IProgress<RegistrationProgress>? progress, Volume<byte>? lesion = null)
    {
        var t = BSplineDeformation.Covering(f.Geometry, b.GridSpacingMm, bulk);
        LesionVolumeTerm? keep = null;
        if (lesion is not null && b.ProtectLesion)
        {
            mask = LesionExclusion(mask, lesion, b.LesionMarginMm);
            if (b.LesionJacobianWeight > 0) keep = LesionVolumeTerm.FromMask(lesion);
        }
        double finest = Math.Min(f.Geometry.SpacingMm.X, Math.Min(f.Geometry.SpacingMm.Y, f.Geometry.SpacingMm.Z));
        var reports = new List<LevelReport>();
        MetricKind? kind = b.Metric;
        string name = "";
        for (int li = 0; li < b.Levels.Count; li++)
        {
            var level = b.Levels[li];
            var images = ResolutionLevel.Build(f, mask, m, level.ShrinkFactor, level.SmoothingSigmaMm, finest, o.MaxThreads);
            int seed = level.Seed ?? o.Seed + 100 + li;
            var set = SampleSet.Draw(images.Fixed, images.Mask, level.Samples, seed);
            var interp = new LinearInterpolator(images.Moving);
            kind ??= Correlation(set, interp, t) >= b.SameContrastCorrelation ? MetricKind.MeanSquares : MetricKind.MattesMutualInformation;
            IBSplineMetric metric = kind == MetricKind.MattesMutualInformation
                ? new BSplineMutualInformation(set, interp, o.MaxThreads, o.HistogramBins, Registrar.Range(set.FixedValues), Registrar.Range(images.Moving.Voxels))
                : new BSplineMeanSquares(set, interp, o.MaxThreads, t);
            name = metric.Name;
            (t, var report) = RunLevel(li, level, metric, keep, t, b, deadline, progress, seed, images);
            if (report.StopReason == StopReason.MetricNotFinite)
                warnings.Add($"deformable level {li}: too few samples overlap the moving image; the level was skipped");
            reports.Add(report);
        }
        CheckFolding(t, f.Geometry, o.MaxThreads, warnings);
        if (reports.Exists(r => r.StopReason == StopReason.TimeLimit))
            warnings.Add("the time limit was reached before the deformable optimisation finished");
        return (t, reports, name);
    }

    /// <summary>Pearson correlation of the fixed samples with the moving image at the starting map (0 when undefined).</summary>
    internal static double Correlation(SampleSet set, LinearInterpolator moving, BSplineDeformation start)
    {
        double sf = 0, sm = 0, sff = 0, smm = 0, sfm = 0;
        int n = 0;
        for (int i = 0; i < set.Count; i++)
        {
            if (!moving.TryEvaluate(start.TransformPoint(set.Point(i)), out double m)) continue;
            double f = set.FixedValues[i];
            sf += f; sm += m; sff += f * f; smm += m * m; sfm += f * m;
            n++;
        }
        if (n < 2) return 0;
        double cov = sfm - sf * sm / n, vf = sff - sf * sf / n, vm = smm - sm * sm / n;
        return vf > 0 && vm > 0 ? cov / Math.Sqrt(vf * vm) : 0;
    }

    /// <summary>metric + weight · bending energy (+ the folding guard) and its gradient at <paramref name="t"/>.</summary>
    internal static double Objective(IBSplineMetric metric, BSplineDeformation t, double weight, Span<double> gradient,
        double foldWeight = 0, double foldThreshold = 0, LesionVolumeTerm? lesion = null, double lesionWeight = 0)
    {
        double v = metric.Evaluate(t, gradient);
        if (!double.IsFinite(v)) return v;
        if (weight > 0) v += weight * BendingEnergy.Evaluate(t, weight, gradient);
        if (foldWeight > 0) v += foldWeight * JacobianPenalty.Evaluate(t, foldThreshold, foldWeight, gradient);
        if (lesion is not null && lesionWeight > 0) v += lesionWeight * lesion.Evaluate(t, lesionWeight, gradient);
        return v;
    }

    /// <summary>
    /// The sample mask without the lesion grown by <paramref name="marginMm"/>: the lesion's own appearance may
    /// change between visits, so it must not drive the deformation. Falls back to the mask when nothing would remain.
    /// </summary>
    internal static Volume<byte> LesionExclusion(Volume<byte>? mask, Volume<byte> lesion, double marginMm)
    {
        var grown = marginMm > 0 ? MaskOps.DilateBox(lesion, marginMm) : lesion;
        var result = new byte[grown.Voxels.Length];
        var g = grown.Voxels;
        long kept = 0;
        for (int i = 0; i < result.Length; i++)
        {
            bool inside = mask is null || mask.Voxels[i] != 0;
            if (inside && g[i] == 0) { result[i] = 1; kept++; }
        }
        return kept > 0 ? new Volume<byte>(lesion.Geometry, result) : mask ?? new Volume<byte>(lesion.Geometry, Enumerable.Repeat((byte)1, result.Length).ToArray());
    }

    private static (BSplineDeformation, LevelReport) RunLevel(int li, RegistrationLevel level, IBSplineMetric metric,
        LesionVolumeTerm? keep, BSplineDeformation t, BSplineStageOptions b, DateTime deadline, IProgress<RegistrationProgress>? progress, int seed,
        ResolutionLevel images)
    {
        var clock = Stopwatch.StartNew();
        var work = t.With();
        var c = work.CoefficientArray;
        double Objective(ReadOnlySpan<double> q, Span<double> g)
        {
            q.CopyTo(c);
            return DeformableStage.Objective(metric, work, b.BendingWeightMm2, g, b.FoldingPenaltyWeight, b.MinJacobian,
                keep, b.LesionJacobianWeight);
        }
        double startValue = Objective(t.CoefficientArray, default);
        var settings = new OptimizerSettings(level.MaxIterations, level.MaxStepMm, level.MinStepMm, DeadlineUtc: deadline);
        Action<int, double>? onIteration = progress is null ? null : (it, v) => progress.Report(new(li, b.Levels.Count, it, v));
        var outcome = LbfgsOptimizer.Minimize(Objective, t.CoefficientArray, settings, onIteration);
        var result = t.With(coefficients: outcome.Parameters);
        var report = new LevelReport(li, images.FixedShrink, images.MovingShrink, images.FixedSigmaMm, metric.SampleCount, seed,
            outcome.Iterations, outcome.StopReason, startValue, outcome.Value, clock.Elapsed.TotalSeconds);
        return (result, report);
    }

    private static void CheckFolding(BSplineDeformation t, Geometry grid, int maxThreads, List<string> warnings)
    {
        var det = t.JacobianDeterminantField(grid, maxThreads).Voxels;
        float min = float.PositiveInfinity;
        foreach (var v in det) if (v < min) min = v;
        if (min <= 0)
            warnings.Add(string.Create(CultureInfo.InvariantCulture,
                $"the deformation folds (minimum Jacobian determinant {min:G3}); increase the bending weight or the control point spacing"));
    }
}
