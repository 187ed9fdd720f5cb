using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Registration;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry register</c>: one registration, written as transform.json.</summary>
internal sealed class RegisterVerb : IVerb
{
    public VerbSpec Spec { get; } = new("register",
        "Align a moving image to a fixed image and write the transform (fixed LPS mm -> moving LPS mm)",
        "--fixed IMG --moving IMG --out transform.json [--preset NAME] [--fixed-mask MASK] [--lesion MASK] [--resampled OUT.nii.gz]",
        [
            new("fixed", "IMG", "fixed (baseline) image: NIfTI, or DICOM file/folder/zip", Required: true),
            new("moving", "IMG", "moving (follow-up, or ADC) image", Required: true),
            new("out", "FILE", "transform.json to write", Required: true),
            new("preset", "NAME", "rigid (default), affine, within-exam or deformable (rigid then cubic B-spline)"),
            new("fixed-mask", "MASK", "mask of the fixed image to focus on (e.g. the gland; dilated by the preset): NIfTI on the fixed grid, DICOM SEG or RTSTRUCT (MASK#ITEM picks a segment / ROI)"),
            new("mask", "MASK", "same as --fixed-mask"),
            new("lesion", "MASK", "baseline lesion on the fixed image: the deformable preset keeps it out of the B-spline samples and reports absorbedChange"),
            new("resampled", "FILE", "also write the moving image resampled onto the fixed grid (NIfTI)"),
            new("threads", "N", "threads to use (default: all cores)"),
        ]);

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var fixedImage = ImageFiles.ReadVolume(args.Required("fixed"));
        var moving = ImageFiles.ReadVolume(args.Required("moving"));
        var maskPath = args.Get("fixed-mask") ?? args.Get("mask");
        var mask = maskPath is null ? null : ReadMask(maskPath, fixedImage, ctx);
        var lesion = args.Get("lesion") is string lesionPath ? ReadMask(lesionPath, fixedImage, ctx) : null;
        var options = RegistrationOptions.ForPreset(args.Get("preset") ?? "rigid") with { MaxThreads = args.GetInt("threads", -1, 1, 256) };
        var result = Registrar.Register(fixedImage, moving, options, mask, lesionMask: lesion);
        TransformFile.Write(args.Required("out"), result);
        if (args.Get("resampled") is string resampled)
            NiftiFile.Write(resampled, Resampler.Resample(moving, fixedImage.Geometry, result.FullTransform, Interpolation.Linear));
        ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"{result.TransformType}: rotation {result.RotationDeg:0.00} deg, shift {result.ShiftMm:0.00} mm, {result.MetricName} {result.MetricBefore:0.####} -> {result.MetricAfter:0.####}, stop: {result.StopReason}"));
        if (result.AbsorbedChange is double absorbed)
            ctx.Out.WriteLine(string.Create(CultureInfo.InvariantCulture, $"absorbed change over the lesion: {absorbed:0.000} (1 = none)"));
        foreach (var w in result.Warnings) ctx.Out.WriteLine($"warning: {w}");
        return 0;
    }

    /// <summary>A mask in any accepted format (docs/masks.md); DICOM masks are placed on the fixed image's grid.</summary>
    private static Volume<byte> ReadMask(string path, Volume<float> fixedImage, CliContext ctx)
    {
        var read = MaskFiles.Read(MaskSource.Parse(path), fixedImage.Geometry);
        foreach (var note in read.Notes) ctx.Err.WriteLine($"mask: {note}");
        return read.Mask;
    }
}
