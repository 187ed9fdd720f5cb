namespace Serimetry.Api.Jobs;

/// <summary>A PSA value with its date (ISO 8601 yyyy-MM-dd) in ng/mL.</summary>
public sealed record PsaValue(string Date, double Value);

/// <summary>
/// Body of <c>POST /v1/comparisons</c>: stored study ids, optional stored mask ids and PSA values, and an optional
/// completion callback URL (POSTed <c>{"comparisonId","state","location"}</c> when the job ends, retried on failure).
/// </summary>
public sealed record ComparisonSubmission(
    string? BaselineStudyId,
    IReadOnlyList<string>? FollowupStudyIds,
    string? GlandMaskId,
    string? LesionMaskId,
    IReadOnlyList<PsaValue>? Psa,
    string? CallbackUrl = null,
    ComparisonSettings? Options = null);

/// <summary>
/// Processing options of a comparison, as <c>serimetry compare</c> offers them; omitted values take the CLI defaults.
/// </summary>
/// <param name="FollowupPreset">Registration of follow-ups to the baseline: rigid (default) or affine.</param>
/// <param name="WithinExam">Align ADC to T2w inside each exam (default true); false trusts the scanner geometry.</param>
/// <param name="Radiomics">Compute the per-visit IBSI radiomic features (default true).</param>
/// <param name="AllowDifferentPatients">Compare exams whose patient IDs differ (default false).</param>
/// <param name="StoreResults">Store sr.dcm and seg-&lt;visit&gt;.dcm on the service's DICOMweb server when done (default false).</param>
public sealed record ComparisonSettings(string? FollowupPreset = null, bool? WithinExam = null, bool? Radiomics = null, bool? AllowDifferentPatients = null,
    bool? StoreResults = null);
