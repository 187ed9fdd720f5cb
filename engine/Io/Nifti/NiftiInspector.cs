using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Nifti;

/// <summary>
/// Describes a NIfTI file for <c>serimetry inspect</c> from its header alone. A NIfTI file carries no
/// study identity or acquisition attributes, so the study fields are null. The role is <see cref="SeriesRole.Other"/>
/// unless the caller says otherwise or an FSL-style <c>.bval</c> sidecar (whitespace-separated b-values, one
/// per volume; common practice) lies beside the file, which makes it a DWI series with those b-values.
/// </summary>
public static class NiftiInspector
{
    /// <summary>Summarises one NIfTI file as a one-series study (geometry in LPS).</summary>
    public static StudySummary Summarize(string path, SeriesRole? role = null)
    {
        var (header, layout, geometry, readWarnings) = NiftiFile.ReadGeometry(path);
        var warnings = new List<string>(readWarnings);
        if (layout.VolumeCount > 1)
            warnings.Add(string.Create(CultureInfo.InvariantCulture, $"4D dataset: {layout.VolumeCount} volumes along dim[4..7]"));
        var bValues = ReadBValues(path, layout.VolumeCount, warnings);
        var assigned = role ?? (bValues.Count > 0 ? SeriesRole.Dwi : SeriesRole.Other);
        string name = StemOf(path);
        var series = new SeriesSummary(
            SeriesInstanceUid: name,
            Role: assigned,
            Size: geometry.Size,
            SpacingMm: geometry.SpacingMm,
            OriginMm: geometry.OriginMm,
            Direction: geometry.Direction,
            BValues: bValues,
            Acquisition: new AcquisitionInfo(SeriesDescription: $"NIfTI-{header.Version} {NiftiDataTypes.Name(header.DataType)}"),
            Source: Path.GetFileName(path),
            Warnings: warnings);
        return new StudySummary(null, null, null, [series]);
    }

    /// <summary>The file name without .nii / .nii.gz.</summary>
    internal static string StemOf(string path)
    {
        string name = Path.GetFileName(path);
        foreach (var ext in new[] { ".nii.gz", ".nii" })
            if (name.EndsWith(ext, StringComparison.OrdinalIgnoreCase)) return name[..^ext.Length];
        return name;
    }

    /// <summary>Distinct ascending b-values from a sidecar STEM.bval, or empty when absent or inconsistent.</summary>
    internal static IReadOnlyList<double> ReadBValues(string path, int volumeCount, List<string> warnings)
    {
        string dir = Path.GetDirectoryName(Path.GetFullPath(path)) ?? ".";
        string bval = Path.Combine(dir, StemOf(path) + ".bval");
        if (!File.Exists(bval)) return [];
        var fields = File.ReadAllText(bval).Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
        var values = new List<double>(fields.Length);
        foreach (var f in fields)
        {
            if (!double.TryParse(f, NumberStyles.Float, CultureInfo.InvariantCulture, out double b) || b < 0 || !double.IsFinite(b))
            {
                warnings.Add($"{Path.GetFileName(bval)} holds '{f}', not a b-value; the sidecar is ignored");
                return [];
            }
            values.Add(b);
        }
        if (values.Count != volumeCount)
        {
            warnings.Add($"{Path.GetFileName(bval)} lists {values.Count} b-values for {volumeCount} volume(s); the sidecar is ignored");
            return [];
        }
        var distinct = values.Distinct().ToList();
        distinct.Sort();
        return distinct;
    }
}
