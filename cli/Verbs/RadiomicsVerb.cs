using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Radiomics;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// <c>serimetry radiomics</c>: IBSI chapter 1 features of an image inside a mask, written as tidy CSV
/// (family, feature, ibsiCode, aggregationCode, value). Settings as JSON (docs/radiomics.md).
/// </summary>
internal sealed class RadiomicsVerb : IVerb
{
    public VerbSpec Spec { get; } = new(
        "radiomics",
        "IBSI chapter 1 radiomic features of an image inside a mask, as tidy CSV",
        "--image IMG --mask MASK [--settings FILE] [--label N] --out features.csv",
        [
            new OptionSpec("image", "IMG", "image: NIfTI (.nii/.nii.gz), or a DICOM file, folder or .zip (its T2w series when it holds several)", Required: true),
            new OptionSpec("mask", "MASK", "ROI: NIfTI on the image grid (non-zero = ROI), DICOM SEG or RTSTRUCT (placed on the image grid); MASK#ITEM picks a segment/ROI/label (docs/masks.md)", Required: true),
            new OptionSpec("settings", "FILE", "processing settings as JSON (default: built-in defaults)"),
            new OptionSpec("label", "N", "NIfTI mask: use only voxels with this label (1..255), same as MASK#N"),
            new OptionSpec("out", "FILE", "output CSV", Required: true),
            new OptionSpec("print-settings", null, "print the effective settings as JSON"),
        ],
        Details: "Reproduce the IBSI digital-phantom check with --settings phantoms/ibsi-digital-phantom.settings.json.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var imagePath = args.Required("image");
        var maskPath = args.Required("mask");
        var outPath = args.Required("out");
        var settings = new RadiomicsSettings();
        if (args.Get("settings") is { } settingsPath)
            settings = RadiomicsSettingsJson.Parse(File.ReadAllText(settingsPath), settingsPath);
        if (args.Has("print-settings")) ctx.Out.WriteLine(RadiomicsSettingsJson.Serialize(settings));

        var image = ImageFiles.ReadVolume(imagePath);
        var source = MaskSource.Parse(maskPath);
        if (args.Has("label"))
        {
            if (source.Item is not null) throw new UsageException("give the label either as --label N or as MASK#N, not both");
            source = source with { Item = args.GetInt("label", 1, 1, 255).ToString(System.Globalization.CultureInfo.InvariantCulture) };
        }
        var read = MaskFiles.Read(source, image.Geometry);
        foreach (var note in read.Notes) ctx.Err.WriteLine($"mask: {note}");
        var mask = read.Mask;
        var features = RadiomicsExtractor.Extract(image, mask, settings);
        using (var writer = new StreamWriter(outPath))
            FeatureCsvWriter.Write(writer, features);
        int undefined = features.Count(f => double.IsNaN(f.Value));
        ctx.Out.WriteLine($"radiomics: {features.Count} feature values written to {outPath} ({undefined} undefined for this ROI, left empty)");
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return CliHost.ExitOk;
    }
}
