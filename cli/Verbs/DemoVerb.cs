using System.Globalization;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry demo --out DIR</c>: the invented demo subject, compared end to end, with its truth beside the results.</summary>
internal sealed class DemoVerb : IVerb
{
    public VerbSpec Spec { get; } = new("demo",
        "Generate the invented demo subject (3 visits, growing lesion, motion) and run compare on it",
        "--out DIR [--seed N] [--threads N]",
        [
            new("out", "DIR", "output folder: exams/ (the generated visits with truth.json) and the comparison's files", Required: true),
            new("seed", "N", "seed of anatomy texture, motion and noise (default: the demo's own)"),
            new("threads", "N", "threads to use (default: all cores)"),
        ],
        Details: "All data is synthetic: an invented subject of the fictional Northfield Surveillance Clinic.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var spec = new PhantomSpec();
        spec = spec with { Seed = args.GetInt("seed", spec.Seed) };
        var outDir = args.Required("out");
        var demo = DemoRun.Run(outDir, spec, ProgressPrinter.For(ctx), args.GetInt("threads", -1, 1, 256));
        CompareVerb.PrintSummary(ctx.Out, demo.Comparison.Report);
        PrintTruth(ctx.Out, demo);
        ctx.Out.WriteLine($"exams and truth: {demo.ExamsFolder}");
        ctx.Out.WriteLine($"report: {Path.Combine(demo.ResultFolder, "report.html")}");
        return demo.Comparison.Report.Partial ? CliHost.ExitFailure : CliHost.ExitOk;
    }

    private static void PrintTruth(TextWriter w, DemoResult demo)
    {
        w.WriteLine();
        w.WriteLine("truth vs measured (synthetic subject, values known by construction):");
        w.WriteLine($"{"visit",5} {"true lesion mL",15} {"measured mL",12} {"true ratio",11} {"measured ratio",15}");
        var visits = demo.Comparison.Report.Visits;
        double? m0 = Value(visits[0], "lesion.volume");
        double t0 = demo.Subject.Visits[0].Truth.LesionVolumeMl;
        foreach (var v in demo.Subject.Visits)
        {
            double? m = Value(visits[v.Index], "lesion.volume");
            double t = v.Truth.LesionVolumeMl;
            string ratio = m is double a && m0 is double b && b > 0 ? (a / b).ToString("0.000", CultureInfo.InvariantCulture) : "n/a";
            w.WriteLine($"{v.Index,5} {t.ToString("0.000", CultureInfo.InvariantCulture),15} {(m?.ToString("0.000", CultureInfo.InvariantCulture) ?? "n/a"),12} {(t / t0).ToString("0.000", CultureInfo.InvariantCulture),11} {ratio,15}");
        }
    }

    private static double? Value(Serimetry.Engine.Reports.VisitRecord v, string id) =>
        v.Values.TryGetValue(id, out var r) ? r.Value : null;
}
