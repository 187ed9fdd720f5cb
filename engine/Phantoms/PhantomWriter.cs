using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Core;
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
            WriteExam(Path.Combine(dir, "exam.json"), subject.SubjectId, v.Date, dwiFiles);
            progress?.Invoke(v.Index + 1);
        }
        PhantomTruthWriter.WriteFile(Path.Combine(directory, "truth.json"), subject);
        File.WriteAllText(Path.Combine(directory, "spec.json"), subject.Spec.ToJson());
    }

    private static void WriteExam(string path, string patientId, DateOnly date, IReadOnlyList<(string B, string File)> dwi)
    {
        using var f = File.Create(path);
        using var w = new Utf8JsonWriter(f, new JsonWriterOptions { Indented = true });
        w.WriteStartObject();
        w.WriteString("patientId", patientId);
        w.WriteString("date", date.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture));
        w.WriteStartObject("series");
        w.WriteString("t2w", "t2w.nii.gz");
        w.WriteString("adc", "adc.nii.gz");
        w.WriteStartObject("dwi");
        foreach (var (b, file) in dwi) w.WriteString(b, file);
        w.WriteEndObject();
        w.WriteEndObject();
        w.WriteEndObject();
    }
}
