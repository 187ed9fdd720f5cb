using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry qa reproducibility</c>: the phantom QA run (engine: <see cref="PhantomReproducibility"/>).</summary>
internal static class QaReproducibility
{
    public static int Run(ParsedArgs args, CliContext ctx)
    {
        var spec = PhantomSpec.Load(args.Required("phantom"));
        int repeats = args.GetInt("repeats", 10, 2, 1000);
        var profile = args.Get("profile") is string p ? RepeatabilityProfile.Load(p) : RepeatabilityProfile.LoadDefault();
        var date = QaVerb.ParseDate(args.Get("date"));
        var radiomicsOut = args.Get("radiomics-out");
        var report = PhantomReproducibility.Run(spec, repeats, profile, r => ctx.Err.Write($"\rre-acquisition {r}/{repeats}"),
            radiomics: radiomicsOut is null ? null : new Engine.Radiomics.RadiomicsSettings());
        ctx.Err.WriteLine();
        QaPrinter.PrintTestRetest(ctx.Out, report.Statistics);
        ctx.Out.WriteLine();
        ctx.Out.WriteLine($"false-positive 'change exceeds noise' rate over {report.FalsePositiveRates.FirstOrDefault()?.Pairs} pairs without true change (profile: {report.ProfileName}):");
        foreach (var r in report.FalsePositiveRates)
            ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"  {r.Measure,-26} profile {(r.RateProfile is double x ? (100 * x).ToString("F1", CultureInfo.InvariantCulture) + "%" : "no entry"),9}   own RC {100 * r.RateOwnRc,5:F1}%"));
        if (args.Get("out") is string output)
        {
            PhantomReproducibilityWriter.WriteFile(output, report, date);
            ctx.Out.WriteLine($"wrote {output}");
        }
        if (radiomicsOut is not null)
        {
            PhantomReproducibilityWriter.WriteRadiomicFeatures(radiomicsOut, report);
            ctx.Out.WriteLine($"wrote {radiomicsOut} ({report.RadiomicFeatures.Count} feature values; one subject: combine runs of several phantoms for ICCs)");
        }
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return 0;
    }
}
