using System.Text.Json;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Writes <c>truth.json</c> of a phantom subject (schema in docs/qa.md): the spec it was generated from and,
/// per visit, <c>transform.matrix</c> (4x4 row-major, baseline LPS mm → visit LPS mm, the registration
/// convention), lesion and gland volumes (analytic and voxelised, mL), lesion and tissue ADC (10⁻⁶ mm²/s),
/// SNR, PSA (ng/mL) and date. No images; those go through the NIfTI/DICOM writers.
/// </summary>
public static class PhantomTruthWriter
{
    /// <summary>Schema id written to the file.</summary>
    public const string SchemaId = "serimetry-phantom-truth/1";

    /// <summary>Writes the truth of <paramref name="subject"/> as indented UTF-8 JSON.</summary>
    public static void Write(Stream stream, PhantomSubject subject)
    {
        using var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true });
        w.WriteStartObject();
        w.WriteString("schema", SchemaId);
        w.WriteString("software", $"{SoftwareInfo.Name} {SoftwareInfo.Version}");
        w.WriteString("subjectId", subject.SubjectId);
        w.WriteString("note", "synthetic subject of the invented Northfield Surveillance Clinic; every value is known truth");
        w.WritePropertyName("spec");
        w.WriteRawValue(subject.Spec.ToJson());
        w.WriteStartArray("visits");
        foreach (var v in subject.Visits) WriteVisit(w, v);
        w.WriteEndArray();
        w.WriteEndObject();
    }

    /// <summary>Writes <c>truth.json</c> to a file path.</summary>
    public static void WriteFile(string path, PhantomSubject subject)
    {
        using var f = File.Create(path);
        Write(f, subject);
    }

    private static void WriteVisit(Utf8JsonWriter w, PhantomVisit v)
    {
        var t = v.Truth;
        w.WriteStartObject();
        w.WriteNumber("index", v.Index);
        w.WriteString("date", t.Date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture));
        w.WriteStartObject("transform");
        w.WriteString("convention", "maps a baseline LPS point (mm) to the visit LPS point (mm); 4x4 row-major");
        WriteArray(w, "matrix", t.BaselineToVisit.ToMatrix4x4());
        w.WriteEndObject();
        w.WriteNumber("lesionVolumeMl", t.LesionVolumeMl);
        w.WriteNumber("lesionVolumeVoxelisedMl", t.LesionVolumeVoxelisedMl);
        w.WriteNumber("glandVolumeMl", t.GlandVolumeMl);
        w.WriteNumber("glandVolumeVoxelisedMl", t.GlandVolumeVoxelisedMl);
        w.WriteNumber("lesionRadiusMm", t.LesionRadiusMm);
        WriteArray(w, "lesionCentreMm", t.LesionCentreMm.ToArray());
        WriteArray(w, "glandCentreMm", t.GlandCentreMm.ToArray());
        w.WriteNumber("lesionAdc", t.LesionAdcUm2PerS);
        w.WriteStartObject("tissueAdc");
        foreach (var (name, adc) in t.TissueAdcUm2PerS) w.WriteNumber(name, adc);
        w.WriteEndObject();
        w.WriteString("adcUnit", "10^-6 mm2/s");
        w.WriteNumber("snr", t.Snr);
        w.WriteNumber("dwiSnr", t.DwiSnr);
        if (t.PsaNgPerMl is double psa) w.WriteNumber("psa", psa); else w.WriteNull("psa");
        if (t.Deformation is { } d)
        {
            w.WriteStartObject("deformation");
            w.WriteString("convention", "visit point q shows baseline point x + u(x), x = inverse(transform)(q); u(x) = A*(sin(2*pi*(y-cy)/L + px), sin(2*pi*(z-cz)/L + py), sin(2*pi*(x-cx)/L + pz)), c = spec glandCentreMm");
            w.WriteNumber("amplitudeMm", d.AmplitudeMm);
            w.WriteNumber("wavelengthMm", d.WavelengthMm);
            WriteArray(w, "phaseRad", d.PhaseRad.ToArray());
            w.WriteEndObject();
        }
        else w.WriteNull("deformation");
        w.WriteEndObject();
    }

    private static void WriteArray(Utf8JsonWriter w, string name, IEnumerable<double> values)
    {
        w.WriteStartArray(name);
        foreach (var x in values) w.WriteNumberValue(x);
        w.WriteEndArray();
    }
}
