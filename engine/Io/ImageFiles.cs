using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Io;

/// <summary>Reads one image volume from a NIfTI file or from a DICOM file, folder or .zip.</summary>
public static class ImageFiles
{
    public static bool IsNifti(string path) =>
        path.EndsWith(".nii", StringComparison.OrdinalIgnoreCase) || path.EndsWith(".nii.gz", StringComparison.OrdinalIgnoreCase);

    /// <summary>
    /// The volume at <paramref name="path"/>: a NIfTI file, or the series of role <paramref name="role"/> in DICOM
    /// data (the only series when there is just one).
    /// </summary>
    public static Volume<float> ReadVolume(string path, SeriesRole role = SeriesRole.T2w)
    {
        if (!File.Exists(path) && !Directory.Exists(path))
            throw new InputFormatException("image not found", path, "give a NIfTI file, or a DICOM file, folder or .zip");
        if (IsNifti(path)) return NiftiFile.ReadVolume(path).Volume;
        var studies = StudyIndex.Build(path, DicomSliceHeaderReader.Default).Assemble();
        if (studies.Count != 1)
            throw new InputFormatException($"{studies.Count} studies found where one image was expected", path,
                "point at one series' folder or file ('serimetry inspect PATH' lists them)");
        var series = studies[0].Series;
        if (series.Count == 1) return StackVolumeBuilder.Build(series[0]);
        var choice = SeriesSelector.Select(studies[0], role);
        return choice.Series is { } s ? StackVolumeBuilder.Build(s)
            : throw new InputFormatException($"{series.Count} series found and {choice.Reason}", path, "point at one series' folder");
    }
}
