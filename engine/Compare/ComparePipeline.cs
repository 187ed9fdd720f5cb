using System.Globalization;
using Serimetry.Engine.Change;
using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Deformable;
using Serimetry.Engine.Reports;

namespace Serimetry.Engine.Compare;

/// <summary>The result of a comparison: the change report and the aligned visits behind its pictures.</summary>
public sealed class CompareResult
{
    internal CompareResult(ChangeReport report, IReadOnlyList<VisitImages> visits, VisitRadiomicsResult? radiomics)
    {
        Report = report;
        Visits = visits;
        Radiomics = radiomics?.Features ?? [];
        RadiomicsScreen = radiomics?.Screen;
    }

    public ChangeReport Report { get; }

    /// <summary>Per-visit IBSI features by region (empty when radiomics were not requested).</summary>
    public IReadOnlyList<Radiomics.Series.VisitFeatures> Radiomics { get; }

    /// <summary>Which radiomic features feed the deltas and why (null when radiomics were not requested).</summary>
    public Radiomics.Robustness.RobustnessScreen? RadiomicsScreen { get; }

    internal IReadOnlyList<VisitImages> Visits { get; }

    /// <summary>The exam paths compared (baseline first), for outputs that reference the source files (DICOM SEG).</summary>
    internal IReadOnlyList<string> ExamPaths { get; init; } = [];
}

/// <summary>
/// The main job: aligns every follow-up to the baseline (and ADC to T2w inside each exam), carries the
/// baseline outlines onto each visit, re-fits the lesion on each visit's own images, measures every visit
/// and builds the change report with bands, trends and comparability.
/// </summary>
public static class ComparePipeline
{
    public static CompareResult Run(CompareRequest request, IProgress<CompareProgress>? progress = null)
    {
        var exams = LoadExams(request);
        var baseline = exams[0];
        var t2Grid = baseline.Exam.T2w.Geometry;
        var masks = new BaselineMasks(request.BaselineExam, t2Grid);
        var gland0 = OnGrid(request.GlandMask is string g ? masks.Read(g) : baseline.GlandMask, t2Grid, "baseline gland mask");
        var lesion0 = OnGrid(request.LesionMask is string l ? masks.Read(l) : baseline.LesionMask, t2Grid, "baseline lesion mask");
        if (gland0 is null)
            throw new InputFormatException("no baseline gland outline was given", "compare",
                "pass --gland MASK (NIfTI on or overlapping the baseline T2w grid)");

        var problems = new List<string>();
        var aligned = new List<VisitImages>();
        int total = exams.Count * 2 + 1;
        for (int k = 0; k < exams.Count; k++)
        {
            progress?.Report(new CompareProgress($"aligning visit {k}", (double)(2 * k) / total));
            aligned.Add(Align(k, exams[k], baseline.Exam, gland0, lesion0, request.Options, problems));
        }

        progress?.Report(new CompareProgress("re-fitting the lesion", (double)(2 * exams.Count) / total));
        if (lesion0 is not null) aligned = RefitLesions(aligned, exams, lesion0, gland0, request.Options.RefitSettings, problems);

        var registry = MeasureRegistry.CreateDefault();
        if (request.Options.PluginFolder is string plugins) registry.LoadPlugins(plugins);
        var inputs = new List<VisitInput>();
        for (int k = 0; k < aligned.Count; k++)
        {
            progress?.Report(new CompareProgress($"measuring visit {k}", (double)(2 * exams.Count + 1 + k) / (total + exams.Count)));
            inputs.Add(Measure(aligned[k], registry, request.Psa, MaskOps.Count(gland0) * t2Grid.VoxelVolumeMm3 / 1000.0));
        }
        if (request.Options.Radiomics is not null) progress?.Report(new CompareProgress("radiomic features", 0.97));
        var radiomics = request.Options.Radiomics is { } rs ? VisitRadiomics.Extract(aligned, rs, request.Options.RadiomicsRobustness, problems) : null;
        var acquisitions = aligned.Select(v => new VisitAcquisition(v.Index, v.Exam.T2wAcquisition, v.Exam.AdcAcquisition,
            v.Exam.BValues, v.Exam.T2w.Geometry.SpacingMm, v.Exam.Adc.Geometry.SpacingMm, v.Exam.AdcSource)).ToList();
        var report = ChangeReportBuilder.Build(inputs, registry.All.Select(MeasureDescriptor.From).ToList(), request.Profile,
            request.Psa, acquisitions, problems: problems, extraSettings: Settings(request.Options, radiomics));
        progress?.Report(new CompareProgress("done", 1));
        return new CompareResult(report, aligned, radiomics) { ExamPaths = [request.BaselineExam, .. request.FollowupExams] };
    }

    private static List<LoadedExam> LoadExams(CompareRequest request)
    {
        if (request.FollowupExams.Count == 0)
            throw new InvalidParameterException("no follow-up exam was given", "compare", "pass at least one --followup EXAM");
        var baseline = ExamLoader.Load(request.BaselineExam);
        var followups = request.FollowupExams.Select(ExamLoader.Load).OrderBy(e => e.Exam.Date).ToList();
        foreach (var f in followups)
        {
            if (f.Exam.Date < baseline.Exam.Date)
                throw new InputFormatException(
                    $"follow-up exam '{f.Exam.Label}' ({f.Exam.Date:yyyy-MM-dd}) is dated before the baseline ({baseline.Exam.Date:yyyy-MM-dd})",
                    "compare", "the baseline must be the earliest exam; swap --baseline and --followup");
            if (!request.Options.AllowDifferentPatients && !SamePatient(baseline.Exam.PatientId, f.Exam.PatientId))
                throw new InputFormatException(
                    $"exams '{baseline.Exam.Label}' and '{f.Exam.Label}' belong to different patients",
                    "compare", "compare exams of one patient, or pass --allow-different-patients if this is intended (e.g. a renamed ID)");
        }
        return [baseline, .. followups];
    }

    private static bool SamePatient(string? a, string? b) =>
        string.IsNullOrWhiteSpace(a) || string.IsNullOrWhiteSpace(b) || string.Equals(a.Trim(), b.Trim(), StringComparison.Ordinal);

    /// <summary>Puts a baseline mask on the baseline T2w grid, resampling through physical space when it was drawn on another grid.</summary>
    private static Volume<byte>? OnGrid(Volume<byte>? mask, Geometry grid, string what)
    {
        if (mask is null) return null;
        var binary = MaskOps.Binarize(mask);
        if (!binary.Geometry.IsCongruentWith(grid, 1e-3))
            binary = Resampler.ResampleMask(binary, grid, null, MaskInterpolation.Nearest);
        if (MaskOps.Count(binary) == 0)
            throw new GeometryMismatchException($"the {what} is empty on the baseline T2w grid", what,
                "check that the mask belongs to this exam and overlaps its T2w images (inspect both geometries)");
        return binary;
    }

    private static VisitImages Align(int index, LoadedExam loaded, Exam baseline, Volume<byte> gland0, Volume<byte>? lesion0,
        ComparisonOptions options, List<string> problems)
    {
        var exam = loaded.Exam;
        var flags = new List<string>();
        var within = WithinExam(exam, options, flags);
        var adcTransform = within?.Transform ?? AffineTransform.Identity;
        var adcOnT2w = Resampler.Resample(exam.Adc, exam.T2w.Geometry, adcTransform, Interpolation.Linear, float.NaN);
        var adcInFrame = InT2wFrame(exam.Adc, adcTransform, adcOnT2w);
        if (index == 0)
            return new VisitImages(0, exam, adcOnT2w, adcInFrame, within, null, gland0, lesion0, null, flags);

        RegistrationResult toBaseline;
        try
        {
            var preset = RegistrationOptions.ForPreset(options.FollowupPreset) with { MaxThreads = options.MaxThreads };
            toBaseline = Registrar.Register(baseline.T2w, exam.T2w, preset, gland0, lesionMask: lesion0);
        }
        catch (RegistrationException e)
        {
            problems.Add($"visit {index}: alignment to baseline failed: {e.Message}");
            flags.Add("not aligned: " + e.Message);
            return new VisitImages(index, exam, adcOnT2w, adcInFrame, within, null, null, null, null, flags);
        }
        var toVisitGrid = toBaseline.Transform.Inverse();
        var gland = loaded.GlandMask is { } own ? OnGrid(own, exam.T2w.Geometry, $"visit {index} gland mask")
            : Resampler.ResampleMask(gland0, exam.T2w.Geometry, toVisitGrid, MaskInterpolation.Nearest);
        var lesion = lesion0 is null ? null : Resampler.ResampleMask(lesion0, exam.T2w.Geometry, toVisitGrid, MaskInterpolation.Nearest);
        if (gland is not null && MaskOps.Count(gland) == 0)
        {
            problems.Add($"visit {index}: the gland carried from baseline falls outside this exam's images");
            flags.Add("gland outside field of view after alignment");
        }
        double? ratio = toBaseline.Deformation is { } d && loaded.GlandMask is null ? JacobianVolume.JacobianVolumeChange(d, gland0) : null;
        return new VisitImages(index, exam, adcOnT2w, adcInFrame, within, toBaseline, gland, lesion, null, flags) { GlandVolumeRatio = ratio };
    }

    /// <summary>
    /// The ADC map with its grid moved into the T2w frame: for a rigid within-exam transform W (T2w point →
    /// ADC point) the voxel at index c sits at W⁻¹(origin + D·S·c), again a valid grid, so ADC statistics use
    /// the scanner's own samples without interpolation. A non-rigid W falls back to the resampled map.
    /// </summary>
    private static Volume<float> InT2wFrame(Volume<float> adc, AffineTransform w, Volume<float> resampled)
    {
        var inverse = w.Inverse();
        var direction = inverse.Linear * adc.Geometry.Direction;
        if (!direction.IsOrthonormal(1e-6)) return resampled;
        return new Volume<float>(adc.Geometry.With(originMm: inverse.TransformPoint(adc.Geometry.OriginMm), direction: direction), adc.Voxels);
    }

    private static RegistrationResult? WithinExam(Exam exam, ComparisonOptions options, List<string> flags)
    {
        if (options.WithinExamPreset is null) return null;
        try
        {
            var preset = RegistrationOptions.ForPreset(options.WithinExamPreset) with { MaxThreads = options.MaxThreads };
            return Registrar.Register(exam.T2w, exam.Adc, preset);
        }
        catch (RegistrationException e)
        {
            flags.Add("ADC kept on scanner geometry: within-exam alignment failed: " + e.Message);
            return null;
        }
    }

    private static List<VisitImages> RefitLesions(List<VisitImages> visits, List<LoadedExam> exams, Volume<byte> lesion0, Volume<byte> gland0,
        LesionRefitSettings settings, List<string> problems)
    {
        var b = visits[0];
        LesionModel model;
        try
        {
            model = LesionRefit.Learn(b.Exam.T2w, b.AdcOnT2w, lesion0, gland0, settings);
        }
        catch (InputException e)
        {
            problems.Add("lesion re-fit disabled: " + e.Message);
            return visits.Select(v => v with { Lesion = v.PropagatedLesion is { } p ? new LesionRefitResult(p, false, e.Message) : null }).ToList();
        }
        var result = new List<VisitImages>(visits.Count);
        for (int k = 0; k < visits.Count; k++)
        {
            var v = visits[k];
            if (exams[k].LesionMask is { } own && k > 0)
                result.Add(v with { Lesion = new LesionRefitResult(OnGrid(own, v.Exam.T2w.Geometry, $"visit {k} lesion mask")!, false, "outline given for this visit") });
            else if (v.PropagatedLesion is null || v.Gland is null)
                result.Add(v);
            else
                result.Add(v with { Lesion = LesionRefit.Refit(v.Exam.T2w, v.AdcOnT2w, v.PropagatedLesion, v.Gland, model, settings) });
        }
        return result;
    }

    private static VisitInput Measure(VisitImages v, MeasureRegistry registry, IReadOnlyList<PsaSample> psa, double baselineGlandMl)
    {
        var ctx = new VisitContext(v.Index, v.Exam.Date, v.Exam.T2w)
        {
            Adc = v.AdcInT2wFrame,
            GlandMask = v.Gland,
            LesionMask = v.Lesion?.Mask ?? v.PropagatedLesion,
            LesionOccupancy = v.Lesion?.Occupancy,
            PsaNgPerMl = PsaKinetics.ValueNear(psa, v.Exam.Date),
            GlandVolumeMlOverride = v.GlandVolumeRatio * baselineGlandMl,
        };
        var values = MeasureRunner.Run(registry.All, ctx);
        float[]? adc = ctx.LesionMask is null ? null : LesionAdcSamples.Collect(ctx, out _)?.Values;
        return new VisitInput(v.Index, v.Exam.Date, v.Exam.StudyInstanceUid, Registration(v), values, adc, Refit(v), v.Flags);
    }

    private static RegistrationRecord? Registration(VisitImages v)
    {
        if (v.ToBaseline is not { } r) return null;
        var flags = r.Warnings.Append($"stop: {r.StopReason}").ToList();
        var file = r.Deformation is null ? null : DeformationFileName(v.Index);
        return new RegistrationRecord(TransformRecord.FromAffine(r.Transform, r.TransformType, file), r.MetricBefore, r.MetricAfter, null, flags)
        {
            AbsorbedChange = r.AbsorbedChange,
        };
    }

    /// <summary>Where a visit's full (B-spline) transform is written beside change.json.</summary>
    internal static string DeformationFileName(int visit) => $"transform-visit-{visit}.json";

    private static LesionRefitRecord? Refit(VisitImages v)
    {
        if (v.Lesion is not { } l || v.PropagatedLesion is not { } p) return null;
        var agreement = MaskAgreement.Compare(l.Mask, p);
        string? volume = l.OccupancyNote is { } why ? $"lesion volume by voxel count, no partial-volume estimate: {why}" : null;
        return new LesionRefitRecord(agreement.Dice, agreement.CentroidShiftMm, new[] { l.Note, volume }.OfType<string>().ToList());
    }

    private static Dictionary<string, string> Settings(ComparisonOptions o, VisitRadiomicsResult? radiomics)
    {
        var settings = Settings(o);
        if (radiomics is not null) settings["radiomics.robustness"] = radiomics.Screen.Summary;
        return settings;
    }

    private static Dictionary<string, string> Settings(ComparisonOptions o) => new()
    {
        ["registration.followup"] = o.FollowupPreset,
        ["registration.withinExam"] = o.WithinExamPreset ?? "none (scanner geometry)",
        ["lesionRefit.searchMarginMm"] = o.RefitSettings.SearchMarginMm.ToString(CultureInfo.InvariantCulture),
        ["lesionRefit.shellMm"] = o.RefitSettings.ShellMm.ToString(CultureInfo.InvariantCulture),
        ["lesionRefit.minSeparationSds"] = o.RefitSettings.MinSeparationSds.ToString(CultureInfo.InvariantCulture),
    };
}
