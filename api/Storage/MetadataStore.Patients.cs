namespace Serimetry.Api.Storage;

/// <summary>A stored study with the time it was stored (ISO 8601, UTC).</summary>
public sealed record StoredStudy(StudyRecord Study, string Created);

public sealed partial class MetadataStore
{
    /// <summary>The studies of one patient, in the order they were stored.</summary>
    public IReadOnlyList<StoredStudy> StudiesOfPatient(string patientId) =>
        Query("SELECT id, patient_id, study_date, kind, series_json, created FROM studies WHERE patient_id = @p ORDER BY created, id",
            r => new StoredStudy(new StudyRecord(r.GetString(0), Str(r, 1), Str(r, 2), r.GetString(3), r.GetString(4)), r.GetString(5)),
            ("@p", patientId));

    /// <summary>The masks stored for a study, oldest first.</summary>
    public IReadOnlyList<MaskRecord> MasksOfStudy(string studyId) =>
        Query("SELECT id, study_id, file, role FROM masks WHERE study_id = @s ORDER BY created, id", MapMask, ("@s", studyId));
}
