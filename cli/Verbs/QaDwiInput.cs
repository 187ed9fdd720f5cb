using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// Loads DWI volumes for the qa verbs: a NIfTI exam folder with exam.json (<c>series.dwi</c> maps b-value →
/// file) or repeated <c>--dwi B=FILE</c>. (DICOM exams go through the exam reader once it exists.)
/// </summary>
internal static class QaDwiInput
{
    public static IReadOnlyList<DwiImage> Load(ParsedArgs args)
    {
        var pairs = new List<(double B, string File)>();
        if (args.Get("exam") is string exam) pairs.AddRange(FromManifest(exam));
        if (args.GetAll("exam").Count > 1) throw new UsageException("give one --exam");
        foreach (var item in args.GetAll("dwi"))
        {
            int eq = item.IndexOf('=');
            if (eq <= 0 || !double.TryParse(item[..eq], NumberStyles.Float, CultureInfo.InvariantCulture, out var b))
                throw new UsageException($"option '--dwi' needs B=FILE (e.g. 800=b800.nii.gz), got '{item}'");
            pairs.Add((b, item[(eq + 1)..]));
        }
        if (pairs.Count == 0) throw new UsageException("give --exam DIR (with exam.json) or --dwi B=FILE for each b-value");
        return pairs.Select(p => new DwiImage(p.B, NiftiFile.ReadVolume(p.File).Volume)).ToList();
    }

    /// <summary>The DWI volumes of one NIfTI exam folder.</summary>
    public static IReadOnlyList<DwiImage> FromExam(string dir) =>
        FromManifest(dir).Select(p => new DwiImage(p.B, NiftiFile.ReadVolume(p.File).Volume)).ToList();

    private static IEnumerable<(double B, string File)> FromManifest(string dir)
    {
        var manifest = Path.Combine(dir, "exam.json");
        if (!File.Exists(manifest)) throw new InputFormatException("exam.json not found", dir, "give a NIfTI exam folder with an exam.json manifest");
        try
        {
            using var doc = JsonDocument.Parse(File.ReadAllText(manifest));
            if (!doc.RootElement.TryGetProperty("series", out var series) || !series.TryGetProperty("dwi", out var dwi) || dwi.ValueKind != JsonValueKind.Object)
                throw new InputFormatException("exam.json has no series.dwi object", manifest, "list DWI files as \"dwi\": {\"800\": \"b800.nii.gz\"}");
            var list = new List<(double, string)>();
            foreach (var p in dwi.EnumerateObject())
            {
                if (!double.TryParse(p.Name, NumberStyles.Float, CultureInfo.InvariantCulture, out var b) || p.Value.ValueKind != JsonValueKind.String)
                    throw new InputFormatException($"series.dwi entry '{p.Name}' is not b-value: file name", manifest);
                list.Add((b, Path.Combine(dir, p.Value.GetString()!)));
            }
            return list;
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"exam.json is not valid JSON ({e.Message})", manifest, null, e);
        }
    }

    public static IReadOnlyList<double>? ParseBValues(string? text)
    {
        if (text is null) return null;
        var list = new List<double>();
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (!double.TryParse(part, NumberStyles.Float, CultureInfo.InvariantCulture, out var b) || b < 0)
                throw new UsageException($"option '--b-values' needs non-negative numbers separated by commas, got '{text}'");
            list.Add(b);
        }
        return list;
    }

    public static AdcFitMethod ParseMethod(string? text) => text switch
    {
        null or "wls" => AdcFitMethod.WeightedLogLinear,
        "lls" => AdcFitMethod.LogLinear,
        "nls" => AdcFitMethod.NonLinear,
        _ => throw new UsageException($"option '--method' must be lls, wls or nls, got '{text}'"),
    };
}
