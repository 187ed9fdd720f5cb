using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Exams;

/// <summary>
/// Loads an exam from a folder or .zip of DICOM files: indexes headers, assembles series, picks the T2w and
/// the ADC series (<see cref="SeriesSelector"/>), and computes ADC from the DWI series when the exam has no
/// ADC map (weighted log-linear fit over b ≥ 200 s/mm², the engine's default; see docs/qa.md).
/// </summary>
public static class DicomExamLoader
{
    public static LoadedExam Load(string path, IReadOnlyDictionary<string, SeriesRole>? roleOverrides = null)
    {
        var index = StudyIndex.Build(path, DicomSliceHeaderReader.Default);
        var studies = index.Assemble(roleOverrides);
        if (studies.Count == 0)
            throw new InputFormatException("no DICOM images found", path, "give a folder or .zip holding one exam's DICOM files, or a folder with exam.json");
        if (studies.Count > 1)
            throw new InputFormatException($"{studies.Count} studies found where one exam was expected", path,
                "give each exam's folder separately (serimetry inspect PATH lists the studies)");
        var study = studies[0];
        string label = Path.GetFileName(Path.GetFullPath(path).TrimEnd(Path.DirectorySeparatorChar));
        var t2Choice = SeriesSelector.Select(study, SeriesRole.T2w);
        var t2Series = t2Choice.Series ?? throw new InputFormatException($"no usable T2-weighted series: {t2Choice.Reason}", path,
            "check the series with 'serimetry inspect', or assign a role with --role UID=t2w");
        var t2w = StackVolumeBuilder.Build(t2Series);
        var (adc, source, adcSeries, bValues) = Adc(study, path);
        var date = ParseDate(study.StudyDate, path);
        var exam = new Exam(label, study.PatientId, date, study.StudyInstanceUid, t2w, adc, source, bValues,
            t2Series.Summary.Acquisition, adcSeries.Summary.Acquisition);
        return new LoadedExam(exam, null, null);
    }

    private static (Volume<float> Adc, AdcSource Source, AssembledSeries Series, IReadOnlyList<double> BValues) Adc(AssembledStudy study, string path)
    {
        var dwiChoice = SeriesSelector.Select(study, SeriesRole.Dwi);
        var adcChoice = SeriesSelector.Select(study, SeriesRole.Adc);
        IReadOnlyList<double> dwiB = dwiChoice.Series?.Summary.BValues ?? [];
        if (adcChoice.Series is { } adcSeries)
            return (StackVolumeBuilder.Build(adcSeries), AdcSource.Scanner, adcSeries, dwiB);
        if (dwiChoice.Series is { } dwi && dwi.Summary.BValues.Count >= 2)
        {
            var images = dwi.Summary.BValues.Select(b => new DwiImage(b, StackVolumeBuilder.Build(dwi, b))).ToList();
            var fit = AdcFitter.Fit(images);
            return (fit.AdcUm2PerS, AdcSource.Computed, dwi, dwi.Summary.BValues);
        }
        throw new InputFormatException("the exam has no ADC map and no DWI series with two or more b-values", path,
            "ADC is needed for the lesion measures; include the scanner ADC series or the DWI series");
    }

    private static DateOnly ParseDate(string? studyDate, string path) =>
        DateOnly.TryParseExact(studyDate, "yyyyMMdd", CultureInfo.InvariantCulture, DateTimeStyles.None, out var d)
            ? d
            : throw new InputFormatException($"Study Date (0008,0020) '{studyDate}' is missing or not YYYYMMDD", path,
                "the exam date orders the visits; the DICOM files need a Study Date");
}
