namespace Serimetry.Api.Hosting;

/// <summary>
/// Settings of <c>serimetry serve</c>, bound from the usual .NET configuration sources (appsettings.json in the
/// data folder, <c>SERIMETRY_</c> environment variables, command line) under the section <c>Serimetry</c>.
/// </summary>
public sealed record ServiceOptions
{
    /// <summary>Data folder: serimetry.db (metadata), jobs.db (job queue), blobs/, studies/, masks/, comparisons/.</summary>
    public string DataDir { get; init; } = "serimetry-data";

    /// <summary>Listening URLs (Kestrel syntax, ';'-separated).</summary>
    public string Urls { get; init; } = "http://127.0.0.1:8080";

    /// <summary>Largest request body accepted (bytes); larger uploads get 413.</summary>
    public long MaxRequestBytes { get; init; } = 2L << 30;

    /// <summary>Comparison jobs run in parallel on this node.</summary>
    public int Workers { get; init; } = 1;

    /// <summary>
    /// Seconds after which a job fetched by a node that stopped answering is handed to another worker
    /// (the job storage's invisibility timeout). Must exceed the longest comparison.
    /// </summary>
    public int JobTimeoutSeconds { get; init; } = 1800;

    /// <summary>Requests per minute allowed per API key (0: no limit); above it 429.</summary>
    public int RequestsPerMinute { get; init; } = 1200;

    /// <summary>
    /// DICOMweb root on which comparisons submitted with <c>options.storeResults</c> get their SR and SEG stored
    /// (STOW-RS) when they finish; null: such submissions are refused.
    /// </summary>
    public string? DicomWebServer { get; init; }

    /// <summary>Authorization header value for <see cref="DicomWebServer"/>, e.g. "Bearer TOKEN" (never logged).</summary>
    public string? DicomWebAuthorization { get; init; }
}
