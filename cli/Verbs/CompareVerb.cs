using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Change;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Robustness;
using Serimetry.Engine.Reports;
using Serimetry.Engine.Reports.Html;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry compare</c>: the main job.</summary>
internal sealed class CompareVerb : IVerb
{
    public VerbSpec Spec { get; } = new("compare",
        "Measure change between a baseline exam and one or more follow-up exams",
        "--baseline EXAM --followup EXAM [--followup EXAM …] --out DIR [options]",
        [
            new("baseline", "EXAM", "baseline exam: a folder with exam.json and NIfTI files, a folder/.zip of DICOM files, or dicomweb:STUDY-UID", Required: true),
            new("followup", "EXAM", "follow-up exam", Repeatable: true, Required: true),
            new("out", "DIR", "output folder (change.json, measures.csv, changes.csv, report.html + PNGs, seg-<visit>.dcm, sr.dcm, radiomics CSV)", Required: true),
            new("gland", "MASK", "baseline whole-gland outline: NIfTI, DICOM SEG or RTSTRUCT; MASK#ITEM picks a segment/ROI (docs/masks.md); default: the baseline exam's own"),
            new("lesion", "MASK", "baseline lesion outline (as --gland); default: the exam's own, else whole-gland measures only"),
            new("psa", "YYYY-MM-DD=NG/ML", "a PSA value with its date", Repeatable: true),
            new("profile", "FILE", "repeatability profile (from 'serimetry qa test-retest'); default: published values"),
            new("followup-preset", "NAME", "follow-up to baseline: rigid (default), affine, or deformable (gland volume from the Jacobian)"),
            new("no-within-exam", null, "trust the scanner geometry between ADC and T2w instead of aligning them"),
            new("allow-different-patients", null, "compare exams whose patient IDs differ"),
            new("threads", "N", "threads to use (default: all cores)"),
            new("plugins", "DIR", "load measure plugins (assemblies with public IMeasure types) from DIR"),
            new("radiomics-settings", "FILE", "IBSI feature settings (JSON, docs/radiomics.md) for radiomics.csv"),
            new("no-radiomics", null, "skip the per-visit radiomic features"),
            new("radiomics-robustness", "FILE", "test-retest feature table (CSV, e.g. from 'serimetry qa reproducibility --radiomics-out'): radiomic deltas use only features with ICC(2,1) at or above --radiomics-icc; default: unfiltered"),
            new("radiomics-icc", "X", "ICC(2,1) a radiomic feature needs to count as robust (default 0.75, 'good' reliability, Koo & Li 2016)"),
            DicomWebArgs.Server(required: false),
            DicomWebArgs.Auth,
            DicomWebArgs.Timeout,
        ],
        Details: "Exams are folders with exam.json or DICOM folders/zips (see README). Every follow-up is aligned to the baseline, the baseline\n" +
                 "outlines are carried onto it and the lesion is re-fitted on its own images. An exam given as dicomweb:STUDY-UID is fetched\n" +
                 "from --server into a temporary folder (removed afterwards) and read as a DICOM exam.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var outDir = args.Required("out");
        var (fetched, request) = DicomWebExams.Resolve(BuildRequest(args), args, ctx);
        using var _ = fetched;
        var result = ComparePipeline.Run(request, ProgressPrinter.For(ctx));
        CompareOutputs.Write(result, outDir);
        PrintSummary(ctx.Out, result.Report);
        ctx.Out.WriteLine($"report: {Path.Combine(outDir, "report.html")}");
        return result.Report.Partial ? CliHost.ExitFailure : CliHost.ExitOk;
    }

    internal static CompareRequest BuildRequest(ParsedArgs args)
    {
        var profile = args.Get("profile") is string p ? RepeatabilityProfile.Load(p) : RepeatabilityProfile.LoadDefault();
        var psa = args.GetAll("psa").Select(ParsePsa).ToList();
        PsaKinetics.Validate(psa);
        if (args.Has("radiomics-icc") && !args.Has("radiomics-robustness"))
            throw new UsageException("option '--radiomics-icc' needs '--radiomics-robustness FILE' (the test-retest table the ICC comes from)");
        var options = new ComparisonOptions(
            AllowDifferentPatients: args.Has("allow-different-patients"),
            FollowupPreset: args.Get("followup-preset") ?? "rigid",
            WithinExamPreset: args.Has("no-within-exam") ? null : "within-exam",
            MaxThreads: args.GetInt("threads", -1, 1, 256),
            PluginFolder: args.Get("plugins"),
            Radiomics: RadiomicsOption(args),
            RadiomicsRobustness: args.Get("radiomics-robustness") is string rr ? RobustnessReference.FromTestRetestFile(rr,
                args.GetDouble("radiomics-icc", FeatureRobustness.DefaultIccThreshold, 0, 1)) : null);
        if (options.FollowupPreset is not ("rigid" or "affine" or "deformable"))
            throw new UsageException($"option '--followup-preset' must be rigid, affine or deformable, got '{options.FollowupPreset}'");
        return new CompareRequest(args.Required("baseline"), args.GetAll("followup"), args.Get("gland"), args.Get("lesion"), psa, profile, options);
    }

    private static RadiomicsSettings? RadiomicsOption(ParsedArgs args)
    {
        if (args.Has("no-radiomics")) return null;
        return args.Get("radiomics-settings") is string f ? RadiomicsSettingsJson.Parse(File.ReadAllText(f), f) : new RadiomicsSettings();
    }

    private static PsaSample ParsePsa(string text)
    {
        var parts = text.Split('=', 2);
        if (parts.Length != 2
            || !DateOnly.TryParseExact(parts[0], "yyyy-MM-dd", CultureInfo.InvariantCulture, DateTimeStyles.None, out var date)
            || !double.TryParse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !(value >= 0) || !double.IsFinite(value))
            throw new UsageException($"option '--psa' needs YYYY-MM-DD=ng/mL (e.g. 2024-03-01=6.2), got '{text}'");
        return new PsaSample(date, value);
    }

    internal static void PrintSummary(TextWriter w, ChangeReport report)
    {
        w.WriteLine();
        w.WriteLine($"{"measure",-26} {"visit",5} {"baseline",10} {"value",10} {"change",10} {"95% band of change",24}  beyond noise");
        foreach (var id in HtmlReport.KeyMeasures)
        {
            foreach (var c in report.Changes.Where(c => c.Measure == id && c.FromVisit == 0))
            {
                string band = c.Ci95 is { Length: 2 } b ? $"{F(b[0])} to {F(b[1])}" : "n/a";
                string noise = c.ExceedsNoise switch { true => "YES", false => "no", _ => "n/a" };
                w.WriteLine($"{id,-26} {c.ToVisit,5} {F(c.Baseline),10} {F(c.Followup),10} {F(c.Delta),10} {band,24}  {noise}");
            }
        }
        foreach (var c in report.Comparability.Where(c => c.Severity != Severity.Info))
            w.WriteLine($"comparability ({c.Severity}): visit {c.FromVisit}->{c.ToVisit} {c.Item}: {c.Message}");
        if (report.Partial)
            foreach (var p in report.Problems) w.WriteLine($"INCOMPLETE: {p}");
        w.WriteLine();
        w.WriteLine(SoftwareInfo.Caution);
    }

    private static string F(double v) => double.IsFinite(v) ? v.ToString(Math.Abs(v) >= 100 ? "0.0" : "0.###", CultureInfo.InvariantCulture) : "n/a";
}

/// <summary>Prints pipeline stages to stderr when it is a terminal.</summary>
internal static class ProgressPrinter
{
    public static IProgress<CompareProgress>? For(CliContext ctx) =>
        Console.IsErrorRedirected || ctx.Err != Console.Error ? null
            : new LineProgress(p => ctx.Err.WriteLine($"[{p.Fraction * 100,3:0}%] {p.Stage}"));

    /// <summary>Reports synchronously, in order (System.Progress posts to the thread pool and may reorder lines).</summary>
    private sealed class LineProgress(Action<CompareProgress> report) : IProgress<CompareProgress>
    {
        public void Report(CompareProgress value) => report(value);
    }
}
