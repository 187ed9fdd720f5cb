using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// <c>serimetry adc</c>: an ADC map (10⁻⁶ mm²/s) from multi-b-value DWI (engine: <see cref="AdcFitter"/>).
/// Inputs are NIfTI (an exam folder with exam.json, or B=FILE pairs); DICOM exams follow once the exam reader exists.
/// </summary>
internal sealed class QaAdcVerb : IVerb
{
    public VerbSpec Spec { get; } = new(
        "adc",
        "Compute an ADC map (10^-6 mm²/s) from DWI at several b-values",
        "(--exam DIR | --dwi B=FILE ...) --out ADC.nii.gz [--b-values 400,800] [--method lls|wls|nls] [--min-b B] [--noise-sigma S] [--mask MASK] [--fit-quality R2.nii.gz]",
        [
            new OptionSpec("exam", "DIR", "NIfTI exam folder whose exam.json lists the DWI files"),
            new OptionSpec("dwi", "B=FILE", "one DWI volume and its b-value (s/mm²)", Repeatable: true),
            new OptionSpec("out", "ADC.nii.gz", "where to write the ADC map", Required: true),
            new OptionSpec("b-values", "B1,B2,...", "b-values to fit (default: all ≥ --min-b)"),
            new OptionSpec("min-b", "B", "exclude b below this to limit perfusion effects (default 200 s/mm²)"),
            new OptionSpec("method", "lls|wls|nls", "log-linear, weighted log-linear (default) or non-linear noise-floor-aware fit"),
            new OptionSpec("noise-sigma", "S", "Gaussian noise SD of the magnitude images (enables noise-floor handling)"),
            new OptionSpec("mask", "MASK", "fit only inside this mask (NIfTI, same grid)"),
            new OptionSpec("fit-quality", "R2.nii.gz", "also write the per-voxel R² goodness-of-fit map"),
        ]);

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var dwi = QaDwiInput.Load(args);
        var mask = args.Get("mask") is string m ? NiftiFile.ReadMask(m) : null;
        var options = new AdcFitOptions(QaDwiInput.ParseMethod(args.Get("method")), args.GetDouble("min-b", 200, 0, 10000),
            QaDwiInput.ParseBValues(args.Get("b-values")), args.GetDouble("noise-sigma", 0, 0, double.MaxValue));
        var result = AdcFitter.Fit(dwi, mask, options);
        var output = args.Required("out");
        NiftiFile.Write(output, result.AdcUm2PerS);
        if (args.Get("fit-quality") is string r2) NiftiFile.Write(r2, result.RSquared);
        ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"ADC from b = {string.Join("/", result.BValuesUsed)} s/mm² ({result.Options.Method}): {result.VoxelsFitted} voxels fitted, {result.VoxelsFailed} without two usable points, {result.VoxelsClamped} clamped"));
        ctx.Out.WriteLine($"wrote {output} (10^-6 mm²/s)");
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return 0;
    }
}
