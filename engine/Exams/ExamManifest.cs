using System.Globalization;
using System.Text.Json;
using System.Text.Json.Serialization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Exams;

/// <summary>
/// <c>exam.json</c>: describes an exam given as NIfTI files (paths relative to the manifest's folder):
/// <c>{"patientId", "date": "YYYY-MM-DD", "studyInstanceUid"?, "series": {"t2w": "t2w.nii.gz",
/// "adc": "adc.nii.gz", "dwi": {"50": "b50.nii.gz", …}}, "acquisition"?: {"t2w": {…}, "adc": {…}}}</c>.
/// ADC maps are in 10^-6 mm²/s.
/// </summary>
public sealed record ExamManifest
{
    public const string FileName = "exam.json";

    public string? PatientId { get; init; }
    public string? Date { get; init; }
    public string? StudyInstanceUid { get; init; }
    public ExamManifestSeries Series { get; init; } = new();
    public Dictionary<string, AcquisitionInfo>? Acquisition { get; init; }

    /// <summary>b-values (s/mm²) the scanner used for its ADC map, when the DWI series are not given.</summary>
    public List<double>? AdcBValues { get; init; }

    /// <summary>Outlines drawn on this exam (paths relative to the manifest); they take precedence over propagated ones.</summary>
    public ExamManifestMasks? Masks { get; init; }

    internal static readonly JsonSerializerOptions Json = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
        WriteIndented = true,
        UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
    };

    /// <summary>Reads and validates a manifest; errors name the file and the offending field.</summary>
    public static ExamManifest Load(string path)
    {
        ExamManifest? m;
        try
        {
            m = JsonSerializer.Deserialize<ExamManifest>(File.ReadAllText(path), Json);
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"malformed exam manifest: {e.Message}", path,
                "exam.json needs {\"patientId\", \"date\": \"YYYY-MM-DD\", \"series\": {\"t2w\": …, \"adc\": …, \"dwi\": {…}}}", e);
        }
        if (m is null) throw new InputFormatException("empty exam manifest", path);
        m.Validate(path);
        return m;
    }

    public void Save(string path) => File.WriteAllText(path, JsonSerializer.Serialize(this, Json));

    /// <summary>The exam date.</summary>
    public DateOnly ParsedDate(string where) =>
        DateOnly.TryParseExact(Date, "yyyy-MM-dd", CultureInfo.InvariantCulture, DateTimeStyles.None, out var d)
            ? d
            : throw new InputFormatException($"exam date '{Date}' is not YYYY-MM-DD", where);

    private void Validate(string path)
    {
        ParsedDate(path);
        if (string.IsNullOrWhiteSpace(Series.T2w))
            throw new InputFormatException("exam manifest names no T2-weighted series (series.t2w)", path);
        if (Series.Adc is null && (Series.Dwi is null || Series.Dwi.Count < 2))
            throw new InputFormatException("exam has no ADC map and fewer than two DWI b-values, so no ADC can be measured", path,
                "add series.adc, or series.dwi with at least two b-values");
        foreach (var key in Series.Dwi?.Keys ?? Enumerable.Empty<string>())
            if (!double.TryParse(key, NumberStyles.Float, CultureInfo.InvariantCulture, out var b) || b < 0 || b > 10000)
                throw new InputFormatException($"DWI key '{key}' is not a b-value in s/mm² (0-10000)", path);
    }
}

/// <summary>The <c>series</c> block of <see cref="ExamManifest"/>.</summary>
public sealed record ExamManifestSeries
{
    public string? T2w { get; init; }
    public string? Adc { get; init; }

    /// <summary>b-value (s/mm², as text) → file.</summary>
    public Dictionary<string, string>? Dwi { get; init; }
}

/// <summary>The optional <c>masks</c> block of <see cref="ExamManifest"/>.</summary>
public sealed record ExamManifestMasks
{
    public string? Gland { get; init; }
    public string? Lesion { get; init; }
}
