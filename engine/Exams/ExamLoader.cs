using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Engine.Exams;

/// <summary>An exam as loaded, with the outlines drawn on it (if any).</summary>
/// <param name="Exam">The exam.</param>
/// <param name="GlandMask">A gland outline given for this exam, or null.</param>
/// <param name="LesionMask">A lesion outline given for this exam, or null.</param>
public sealed record LoadedExam(Exam Exam, Volume<byte>? GlandMask, Volume<byte>? LesionMask);

/// <summary>
/// Loads an exam: a folder holding <c>exam.json</c> and NIfTI files (or the exam.json file itself), else a
/// folder or .zip of DICOM files (<see cref="DicomExamLoader"/>).
/// </summary>
public static class ExamLoader
{
    public static LoadedExam Load(string path)
    {
        if (!Directory.Exists(path) && !File.Exists(path))
            throw new InputFormatException("exam not found", path, "give an exam folder, a .zip of DICOM files, or an exam.json file");
        string manifestPath = Directory.Exists(path) ? Path.Combine(path, ExamManifest.FileName) : path;
        if (!File.Exists(manifestPath) || !manifestPath.EndsWith(".json", StringComparison.OrdinalIgnoreCase))
            return DicomExamLoader.Load(path);
        var m = ExamManifest.Load(manifestPath);
        string dir = Path.GetDirectoryName(Path.GetFullPath(manifestPath))!;
        string label = Path.GetFileName(dir);
        var t2w = NiftiFile.ReadVolume(Resolve(dir, m.Series.T2w!, manifestPath)).Volume;
        if (m.Series.Adc is null)
            throw new UnsupportedInputException("this exam has no ADC map; computing ADC from DWI is not wired into compare yet", manifestPath,
                "add series.adc (10^-6 mm²/s)");
        var adc = NiftiFile.ReadVolume(Resolve(dir, m.Series.Adc, manifestPath)).Volume;
        IReadOnlyList<double> bValues = m.Series.Dwi is { Count: > 0 }
            ? m.Series.Dwi.Keys.Select(k => double.Parse(k, CultureInfo.InvariantCulture)).Order().ToList()
            : (m.AdcBValues ?? []).Order().ToList();
        var exam = new Exam(label, m.PatientId, m.ParsedDate(manifestPath), m.StudyInstanceUid, t2w, adc, AdcSource.Scanner, bValues,
            Acquisition(m, "t2w"), Acquisition(m, "adc"));
        var gland = m.Masks?.Gland is string g ? ReadMask(dir, g, manifestPath, t2w.Geometry) : null;
        var lesion = m.Masks?.Lesion is string l ? ReadMask(dir, l, manifestPath, t2w.Geometry) : null;
        return new LoadedExam(exam, gland, lesion);
    }

    private static AcquisitionInfo Acquisition(ExamManifest m, string key) =>
        m.Acquisition is not null && m.Acquisition.TryGetValue(key, out var a) ? a : new AcquisitionInfo();

    /// <summary>An outline named in exam.json (NIfTI, SEG or RTSTRUCT, optionally PATH#ITEM; docs/masks.md).</summary>
    private static Volume<byte> ReadMask(string dir, string relative, string manifestPath, Geometry t2Grid)
    {
        var source = MaskSource.Parse(Path.Combine(dir, relative));
        Resolve(dir, Path.GetRelativePath(dir, source.Path), manifestPath);
        return MaskFiles.Read(source, t2Grid).Mask;
    }

    private static string Resolve(string dir, string relative, string manifestPath)
    {
        var full = Path.GetFullPath(Path.Combine(dir, relative));
        if (!File.Exists(full))
            throw new InputFormatException($"the exam manifest names '{relative}', which does not exist", manifestPath,
                "paths in exam.json are relative to its folder");
        return full;
    }
}
