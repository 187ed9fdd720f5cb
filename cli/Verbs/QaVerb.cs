using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// <c>serimetry qa test-retest --input table.csv --out profile.json</c>: test-retest statistics per measure
/// and the site's repeatability profile (docs/qa.md). Computation lives in Serimetry.Engine.Repeatability.
/// </summary>
internal sealed class QaVerb : IVerb
{
    public VerbSpec Spec { get; } = new(
        "qa",
        "Quality assurance: test-retest statistics, repeatability profile, phantom checks",
        "test-retest --input TABLE.csv --out PROFILE.json [--scale auto|log|absolute] [--date YYYY-MM-DD]\n"
        + "       serimetry qa reproducibility --phantom SPEC.json --repeats R [--profile PROFILE.json] [--out QA.json] [--radiomics-out FEATURES.csv]\n"
        + "       serimetry qa dwi-phantom (--exam DIR | --dwi B=FILE ...) [--roi MASK] [--temperature C | --reference ADC] [--tolerance PCT]",
        [
            new OptionSpec("input", "TABLE.csv", "tidy CSV with header subject,measure,repeat,value"),
            new OptionSpec("out", "PROFILE.json", "where to write the statistics / repeatability profile"),
            new OptionSpec("scale", "auto|log|absolute", "error scale of the profile entries (auto: log when all values are positive)"),
            new OptionSpec("date", "YYYY-MM-DD", "date of the QA run recorded in each entry's source (default: today, UTC)"),
            new OptionSpec("phantom", "SPEC.json", "reproducibility: phantom specification (e.g. phantoms/qa-reproducibility.json)"),
            new OptionSpec("repeats", "R", "reproducibility: number of noisy re-acquisitions (2-1000)"),
            new OptionSpec("profile", "PROFILE.json", "reproducibility: profile to judge change against (default: published defaults)"),
            new OptionSpec("radiomics-out", "FEATURES.csv", "reproducibility: also write each repeat's radiomic features (test-retest table for compare --radiomics-robustness)"),
            new OptionSpec("exam", "DIR", "dwi-phantom: NIfTI exam folder whose exam.json lists the DWI files (repeat for repeatability across scans)", Repeatable: true),
            new OptionSpec("dwi", "B=FILE", "dwi-phantom: one DWI volume and its b-value (s/mm²)", Repeatable: true),
            new OptionSpec("roi", "MASK", "dwi-phantom: vial label mask (NIfTI); default: find circular vials"),
            new OptionSpec("temperature", "C", "dwi-phantom: water temperature; reference from the Speedy-Angell law (default 0 °C ice water)"),
            new OptionSpec("reference", "ADC", "dwi-phantom: reference ADC in 10^-6 mm²/s (overrides --temperature)"),
            new OptionSpec("tolerance", "PCT", "dwi-phantom: pass when |bias| ≤ PCT % (default 5)"),
            new OptionSpec("b-values", "B1,B2,...", "dwi-phantom: b-values to fit (default: all ≥ --min-b)"),
            new OptionSpec("min-b", "B", "dwi-phantom: exclude b below this (default 0: water has no perfusion)"),
            new OptionSpec("method", "lls|wls|nls", "dwi-phantom: ADC fit (default wls)"),
        ],
        MinPositionals: 1, MaxPositionals: 1,
        Details: "Sub-commands:\n  test-retest   wSD, wCV (log method), RC = 2.77·wSD, ICC(1,1) (2,1) (3,1) and average forms with 95 % CIs,\n"
               + "                Bland-Altman bias and limits (exactly two repeats); the output loads as a repeatability profile.\n"
               + "  reproducibility  R re-acquisitions of one digital phantom (no true change): measured wCV/RC per measure and the\n"
               + "                rate at which 'change exceeds noise' is flagged between them (the engine's own noise floor).\n"
               + "  dwi-phantom   ADC per vial of a DWI phantom scan against water's diffusion coefficient (ice water: 1099 ×10^-6 mm²/s);\n"
               + "                exit code 1 when a vial fails its tolerance; several --exam give repeatability across scans.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        return args.Positionals[0] switch
        {
            "test-retest" => RunTestRetest(args, ctx),
            "reproducibility" => QaReproducibility.Run(args, ctx),
            "dwi-phantom" => QaDwiPhantom.Run(args, ctx),
            var other => throw new UsageException($"unknown qa sub-command '{other}' (expected test-retest, reproducibility or dwi-phantom)"),
        };
    }

    private static int RunTestRetest(ParsedArgs args, CliContext ctx)
    {
        string input = args.Required("input"), output = args.Required("out");
        var scale = args.Get("scale") switch
        {
            null or "auto" => ScaleChoice.Auto,
            "log" => ScaleChoice.Log,
            "absolute" => ScaleChoice.Absolute,
            var s => throw new UsageException($"option '--scale' must be auto, log or absolute, got '{s}'"),
        };
        var date = ParseDate(args.Get("date"));
        var rows = TestRetestCsv.ReadFile(input);
        var report = TestRetestAnalysis.Analyse(rows);
        TestRetestProfileWriter.WriteFile(output, report, date, scale);
        QaPrinter.PrintTestRetest(ctx.Out, report);
        ctx.Out.WriteLine($"wrote {output}");
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return 0;
    }

    internal static DateOnly ParseDate(string? text)
    {
        if (text is null) return DateOnly.FromDateTime(DateTime.UtcNow);
        if (!DateOnly.TryParseExact(text, "yyyy-MM-dd", CultureInfo.InvariantCulture, DateTimeStyles.None, out var d))
            throw new UsageException($"option '--date' needs YYYY-MM-DD, got '{text}'");
        return d;
    }
}
