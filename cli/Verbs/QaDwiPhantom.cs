using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry qa dwi-phantom</c>: ADC of phantom vials against a reference (engine: <see cref="DwiPhantomCheck"/>).</summary>
internal static class QaDwiPhantom
{
    public static int Run(ParsedArgs args, CliContext ctx)
    {
        var exams = args.GetAll("exam");
        if (exams.Count > 1) return RunRepeated(args, ctx, exams);
        var dwi = QaDwiInput.Load(args);
        var rois = args.Get("roi") is string roi ? NiftiFile.ReadMask(roi) : null;
        var options = Options(args, out double reference, out string source);
        var report = DwiPhantomCheck.Run(dwi, rois, options);
        Print(ctx, report, reference, source);
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return report.Pass ? 0 : 1;
    }

    private static int RunRepeated(ParsedArgs args, CliContext ctx, IReadOnlyList<string> exams)
    {
        var rois = args.Get("roi") is string roi ? NiftiFile.ReadMask(roi) : null;
        var options = Options(args, out double reference, out string source);
        var reports = new List<DwiPhantomReport>();
        foreach (var exam in exams)
        {
            ctx.Out.WriteLine($"{Path.GetFileName(Path.TrimEndingDirectorySeparator(exam))}:");
            var report = DwiPhantomCheck.Run(QaDwiInput.FromExam(exam), rois, options);
            Print(ctx, report, reference, source);
            reports.Add(report);
        }
        var rep = DwiPhantomRepeatability.Analyse(reports);
        ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"repeatability over {exams.Count} scans: wSD {rep.WithinSubjectSd:F2} ×10^-6 mm²/s, wCV {100 * (rep.WithinSubjectCv ?? double.NaN):F2} %, RC {rep.Rc:F2}"));
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return reports.All(r => r.Pass) ? 0 : 1;
    }

    private static DwiPhantomOptions Options(ParsedArgs args, out double reference, out string source)
    {
        reference = DwiPhantomCheck.IceWaterAdcUm2PerS;
        source = DwiPhantomCheck.IceWaterSource;
        if (args.Has("temperature"))
        {
            double t = args.GetDouble("temperature", 0, -20, 60);
            reference = DwiPhantomCheck.WaterAdcUm2PerS(t);
            source = FormattableString.Invariant($"water at {t} °C: Speedy-Angell law with Holz, Heil & Sacco, PCCP 2000 parameters");
        }
        if (args.Has("reference"))
        {
            reference = args.GetDouble("reference", reference, 1, 10000);
            source = "user-given reference";
        }
        var fit = new AdcFitOptions(QaDwiInput.ParseMethod(args.Get("method")), BValues: QaDwiInput.ParseBValues(args.Get("b-values")),
            MinBValue: args.GetDouble("min-b", 0, 0, 10000));
        return new DwiPhantomOptions(reference, args.GetDouble("tolerance", 5, 0.01, 100), fit, ReferenceSource: source);
    }

    private static void Print(CliContext ctx, DwiPhantomReport report, double reference, string source)
    {
        ctx.Out.WriteLine($"reference: {reference:F0} ×10^-6 mm²/s ({source}); tolerance ±{report.TolerancePercent:G3} %; b-values {string.Join("/", report.BValuesUsed)} s/mm²");
        foreach (var v in report.Vials)
            ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"  vial {v.Label}: {v.Voxels} voxels, ADC {v.MeanAdcUm2PerS:F1} ± {v.SdAdcUm2PerS:F1}, bias {v.BiasPercent:+0.00;-0.00} % → {(v.Pass ? "PASS" : "FAIL")}"));
        ctx.Out.WriteLine(report.Pass ? "result: PASS" : "result: FAIL");
    }
}
