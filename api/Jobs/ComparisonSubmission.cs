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
    string? CallbackUrl = null);
