using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Writes a phantom subject as NIfTI exams (docs/qa.md): <c>DIR/visit-&lt;k&gt;/{t2w.nii.gz, adc.nii.gz,
/// b&lt;value&gt;.nii.gz, exam.json}</c>, <c>DIR/visit-&lt;k&gt;/masks/{gland,zones,lesion}.nii.gz</c>, <c>DIR/truth.json</c>
/// and <c>DIR/spec.json</c> (the spec, to re-create the same phantom). exam.json is the manifest
/// <c>{"patientId","date","series":{"t2w","adc","dwi":{"&lt;b&gt;":file}}}</c>.
/// </summary>
public static class PhantomWriter
{
    /// <summary>Writes every visit; <paramref name="progress"/> is told after each visit.</summary>
    public static void WriteNifti(string directory, PhantomSubject subject, Action<int>? progress = null)
    {
        Directory.CreateDirectory(directory);
        foreach (var v in subject.Visits)
        {
            var dir = Path.Combine(directory, $"visit-{v.Index}");
            var masks = Path.Combine(dir, "masks");
            Directory.CreateDirectory(masks);
            NiftiFile.Write(Path.Combine(dir, "t2w.nii.gz"), v.T2w);
            NiftiFile.Write(Path.Combine(dir, "adc.nii.gz"), v.Adc);
            var dwiFiles = new List<(string B, string File)>();
            foreach (var d in v.Dwi)
            {
                string b = d.BValue.ToString("0.###", CultureInfo.InvariantCulture);
                string file = $"b{b}.nii.gz";
                NiftiFile.Write(Path.Combine(dir, file), d.Image);
                dwiFiles.Add((b, file));
            }
            NiftiFile.Write(Path.Combine(masks, "gland.nii.gz"), v.GlandMask);
            NiftiFile.Write(Path.Combine(masks, "zones.nii.gz"), v.ZoneMask);
            NiftiFile.Write(Path.Combine(masks, "lesion.nii.gz"), v.LesionMask);
            WriteExam(Path.Combine(dir, ExamManifest.FileName), subject.SubjectId, v, dwiFiles);
            progress?.Invoke(v.Index + 1);
        }
        PhantomTruthWriter.WriteFile(Path.Combine(directory, "truth.json"), subject);
        File.WriteAllText(Path.Combine(directory, "spec.json"), subject.Spec.ToJson());
    }

    private static void WriteExam(string path, string patientId, PhantomVisit v, IReadOnlyList<(string B, string File)> dwi) =>
        new ExamManifest
        {
            PatientId = patientId,
            Date = v.Date.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture),
            Series = new ExamManifestSeries { T2w = "t2w.nii.gz", Adc = "adc.nii.gz", Dwi = dwi.ToDictionary(d => d.B, d => d.File) },
            Acquisition = new Dictionary<string, AcquisitionInfo> { ["t2w"] = v.T2wAcquisition, ["adc"] = v.DwiAcquisition },
        }.Save(path);
}
