namespace Serimetry.Api.Storage;

/// <summary>A stored study: id (content hash), patient and date from its headers, indexed series as JSON.</summary>
public sealed record StudyRecord(string Id, string? PatientId, string? StudyDate, string Kind, string SeriesJson);

/// <summary>A stored mask file of a study.</summary>
/// <remarks><see cref="Role"/> (gland or lesion, optional) lets the DICOM trigger rule find a baseline's outlines.</remarks>
public sealed record MaskRecord(string Id, string StudyId, string File, string? Role = null);

/// <summary>A comparison job's row: state queued/running/done/failed, stage and percent while running, problem when failed.</summary>
public sealed record ComparisonRecord(string Id, string? PatientId, string RequestJson, string State, string? Stage, double Percent,
    string? ProblemJson, int Runs, string Created, string? Finished);

/// <summary>An API key's stored hash.</summary>
public sealed record KeyRecord(string Id, string Name, byte[] Salt, byte[] Hash);

public sealed partial class MetadataStore
{
    /// <summary>Stores a study unless one with that id exists (idempotent upload); returns the stored row.</summary>
    public StudyRecord AddStudy(StudyRecord s)
    {
        Execute("INSERT INTO studies (id, patient_id, study_date, kind, series_json, created) VALUES (@id, @p, @d, @k, @s, @c) ON CONFLICT DO NOTHING",
            ("@id", s.Id), ("@p", s.PatientId), ("@d", s.StudyDate), ("@k", s.Kind), ("@s", s.SeriesJson), ("@c", Now()));
        return FindStudy(s.Id)!;
    }

    /// <summary>The study with that id, or null.</summary>
    public StudyRecord? FindStudy(string id) =>
        Query("SELECT id, patient_id, study_date, kind, series_json FROM studies WHERE id = @id",
            r => new StudyRecord(r.GetString(0), Str(r, 1), Str(r, 2), r.GetString(3), r.GetString(4)), ("@id", id)).FirstOrDefault();

    /// <summary>Stores a mask (idempotent on its id).</summary>
    public void AddMask(MaskRecord m) =>
        Execute("INSERT INTO masks (id, study_id, file, created, role) VALUES (@id, @s, @f, @c, @r) ON CONFLICT DO NOTHING",
            ("@id", m.Id), ("@s", m.StudyId), ("@f", m.File), ("@c", Now()), ("@r", m.Role));

    /// <summary>The mask with that id, or null.</summary>
    public MaskRecord? FindMask(string id) =>
        Query("SELECT id, study_id, file, role FROM masks WHERE id = @id", MapMask, ("@id", id)).FirstOrDefault();

    private static MaskRecord MapMask(System.Data.Common.DbDataReader r) => new(r.GetString(0), r.GetString(1), r.GetString(2), Str(r, 3));

    /// <summary>Adds a queued comparison.</summary>
    public void AddComparison(string id, string? patientId, string requestJson) =>
        Execute("INSERT INTO comparisons (id, patient_id, request_json, state, created) VALUES (@id, @p, @r, 'queued', @c)",
            ("@id", id), ("@p", patientId), ("@r", requestJson), ("@c", Now()));

    private const string ComparisonColumns = "id, patient_id, request_json, state, stage, percent, problem_json, runs, created, finished";

    private static ComparisonRecord MapComparison(System.Data.Common.DbDataReader r) =>
        new(r.GetString(0), Str(r, 1), r.GetString(2), r.GetString(3), Str(r, 4), r.GetDouble(5), Str(r, 6), r.GetInt32(7), r.GetString(8), Str(r, 9));

    /// <summary>The comparison with that id, or null.</summary>
    public ComparisonRecord? FindComparison(string id) =>
        Query($"SELECT {ComparisonColumns} FROM comparisons WHERE id = @id", MapComparison, ("@id", id)).FirstOrDefault();

    /// <summary>The comparisons of one patient, oldest first.</summary>
    public IReadOnlyList<ComparisonRecord> ComparisonsOfPatient(string patientId) =>
        Query($"SELECT {ComparisonColumns} FROM comparisons WHERE patient_id = @p ORDER BY created", MapComparison, ("@p", patientId));

    /// <summary>Marks a comparison running (counting the attempt) unless it already finished; false when finished.</summary>
    public bool StartComparison(string id) =>
        Execute("UPDATE comparisons SET state = 'running', stage = 'starting', percent = 0, runs = runs + 1 WHERE id = @id AND state IN ('queued', 'running')",
            ("@id", id)) == 1;

    /// <summary>Records progress of a running comparison.</summary>
    public void Progress(string id, string stage, double percent) =>
        Execute("UPDATE comparisons SET stage = @s, percent = @p WHERE id = @id AND state = 'running'", ("@id", id), ("@s", stage), ("@p", percent));

    /// <summary>
    /// Marks a comparison done or failed (with its problem document) unless it already ended; true when this call ended
    /// it. Conditional, so a late second attempt can neither end a comparison twice nor turn done into failed.
    /// </summary>
    public bool FinishComparison(string id, string state, string? problemJson) =>
        Execute("""
            UPDATE comparisons SET state = @st, percent = CASE WHEN @st = 'done' THEN 100 ELSE percent END, problem_json = @pj, finished = @f
            WHERE id = @id AND state IN ('queued', 'running')
            """, ("@id", id), ("@st", state), ("@pj", problemJson), ("@f", Now())) == 1;

    /// <summary>Stores an API key's salted hash.</summary>
    public void AddKey(KeyRecord k) =>
        Execute("INSERT INTO keys (id, name, salt, hash, created) VALUES (@id, @n, @s, @h, @c)",
            ("@id", k.Id), ("@n", k.Name), ("@s", k.Salt), ("@h", k.Hash), ("@c", Now()));

    /// <summary>The key with that id, or null.</summary>
    public KeyRecord? FindKey(string id) =>
        Query("SELECT id, name, salt, hash FROM keys WHERE id = @id",
            r => new KeyRecord(r.GetString(0), r.GetString(1), (byte[])r[2], (byte[])r[3]), ("@id", id)).FirstOrDefault();
}
