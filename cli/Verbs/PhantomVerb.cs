using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Phantoms;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// <c>serimetry phantom --out DIR --seed N …</c>: a synthetic subject of the invented Northfield Surveillance
/// Clinic with K visits and truth.json (engine: <see cref="PhantomGenerator"/>, <see cref="PhantomWriter"/>).
/// </summary>
internal sealed class PhantomVerb : IVerb
{
    public VerbSpec Spec { get; } = new(
        "phantom",
        "Generate a digital phantom subject with known truth (motion, lesion growth, ADC)",
        "--out DIR [--spec SPEC.json] [--seed N] [--visits K] [--growth F] [--max-rotate DEG] [--max-shift MM] [--deform MM] [--format nifti|dicom]",
        [
            new OptionSpec("out", "DIR", "output folder (visit-<k>/, truth.json, spec.json)", Required: true),
            new OptionSpec("spec", "SPEC.json", "phantom specification (default: built-in demo, same as phantoms/demo.json)"),
            new OptionSpec("seed", "N", "seed of anatomy texture, motion and noise"),
            new OptionSpec("visits", "K", "number of exams (1-20)"),
            new OptionSpec("growth", "F", "lesion volume factor per visit"),
            new OptionSpec("max-rotate", "DEG", "largest rotation between baseline and a visit"),
            new OptionSpec("max-shift", "MM", "largest translation between baseline and a visit"),
            new OptionSpec("deform", "MM", "amplitude of an optional mild divergence-free deformation of follow-ups (0-5 mm)"),
            new OptionSpec("format", "nifti|dicom", "output format: NIfTI files with exam.json, or DICOM MR series (docs/dicom-out.md)"),
        ],
        Details: "Options given on the command line override the spec file. Same spec and seed give identical files.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var format = args.Get("format") ?? "nifti";
        if (format is not ("nifti" or "dicom"))
            throw new UnsupportedInputException($"phantom output format '{format}' is not available", "--format", "use --format nifti or --format dicom");
        var spec = args.Get("spec") is string path ? PhantomSpec.Load(path) : new PhantomSpec();
        spec = spec with
        {
            Seed = args.GetInt("seed", spec.Seed),
            Visits = args.GetInt("visits", spec.Visits, 1, 20),
            GrowthPerVisit = args.GetDouble("growth", spec.GrowthPerVisit, 0.01, 10),
            MaxRotateDeg = args.GetDouble("max-rotate", spec.MaxRotateDeg, 0, 45),
            MaxShiftMm = args.GetDouble("max-shift", spec.MaxShiftMm, 0, 100),
            DeformationMm = args.GetDouble("deform", spec.DeformationMm, 0, 5),
        };
        if (spec.PsaNgPerMl.Length > 0 && spec.PsaNgPerMl.Length < spec.Visits)
            spec = spec with { PsaNgPerMl = ExtendPsa(spec.PsaNgPerMl, spec.Visits) };
        var subject = PhantomGenerator.Generate(spec);
        var outDir = args.Required("out");
        Action<int> progress = k => ctx.Err.Write($"\rwrote visit {k}/{spec.Visits}");
        if (format == "dicom") PhantomDicomWriter.Write(outDir, subject, progress);
        else PhantomWriter.WriteNifti(outDir, subject, progress);
        ctx.Err.WriteLine();
        foreach (var v in subject.Visits)
            ctx.Out.WriteLine(FormattableString.Invariant(
                $"visit {v.Index} {v.Date:yyyy-MM-dd}: lesion {v.Truth.LesionVolumeMl:F3} mL (voxelised {v.Truth.LesionVolumeVoxelisedMl:F3}), gland {v.Truth.GlandVolumeMl:F1} mL, PSA {v.Truth.PsaNgPerMl?.ToString("F1", System.Globalization.CultureInfo.InvariantCulture) ?? "-"} ng/mL"));
        ctx.Out.WriteLine($"wrote {outDir} (synthetic data of an invented subject; truth in truth.json)");
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return 0;
    }

    /// <summary>More visits than PSA values: continue the last interval's ratio (exponential PSA rise).</summary>
    private static double[] ExtendPsa(double[] psa, int visits)
    {
        var list = psa.ToList();
        double ratio = list.Count >= 2 ? list[^1] / list[^2] : 1.1;
        while (list.Count < visits) list.Add(Math.Round(list[^1] * ratio, 2));
        return [.. list];
    }
}
