using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
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
            new OptionSpec("image", "IMG", "image (NIfTI .nii/.nii.gz)", Required: true),
            new OptionSpec("mask", "MASK", "ROI mask on the same grid (NIfTI; non-zero = ROI)", Required: true),
            new OptionSpec("settings", "FILE", "processing settings as JSON (default: built-in defaults)"),
            new OptionSpec("label", "N", "use only voxels with this mask label (1..255)"),
            new OptionSpec("out", "FILE", "output CSV", Required: true),
            new OptionSpec("print-settings", null, "print the effective settings as JSON"),
        ],
        Details: "Reproduce the IBSI digital-phantom check with --settings phantoms/ibsi-digital-phantom.settings.json.\n"
            + "DICOM input is not wired into this verb yet; convert to NIfTI first.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var imagePath = args.Required("image");
        var maskPath = args.Required("mask");
        var outPath = args.Required("out");
        var settings = new RadiomicsSettings();
        if (args.Get("settings") is { } settingsPath)
            settings = RadiomicsSettingsJson.Parse(File.ReadAllText(settingsPath), settingsPath);
        if (args.Has("print-settings")) ctx.Out.WriteLine(RadiomicsSettingsJson.Serialize(settings));

        var image = NiftiFile.ReadVolume(RequireNifti(imagePath)).Volume;
        var mask = NiftiFile.ReadMask(RequireNifti(maskPath));
        if (args.Has("label"))
        {
            int label = args.GetInt("label", 1, 1, 255);
            var selected = mask.Like<byte>();
            for (int n = 0; n < mask.Voxels.Length; n++) selected.Voxels[n] = mask.Voxels[n] == label ? (byte)1 : (byte)0;
            mask = selected;
        }
        var features = RadiomicsExtractor.Extract(image, mask, settings);
        using (var writer = new StreamWriter(outPath))
            FeatureCsvWriter.Write(writer, features);
        int undefined = features.Count(f => double.IsNaN(f.Value));
        ctx.Out.WriteLine($"radiomics: {features.Count} feature values written to {outPath} ({undefined} undefined for this ROI, left empty)");
        ctx.Out.WriteLine(SoftwareInfo.Caution);
        return CliHost.ExitOk;
    }

    private static string RequireNifti(string path)
    {
        if (Directory.Exists(path) || path.EndsWith(".dcm", StringComparison.OrdinalIgnoreCase))
            throw new UnsupportedInputException("DICOM input is not supported by this verb yet", path,
                "convert the series and mask to NIfTI (.nii or .nii.gz) first");
        return path;
    }
}
