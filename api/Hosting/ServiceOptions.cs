namespace Serimetry.Api.Hosting;

/// <summary>
/// Settings of <c>serimetry serve</c>, bound from the usual .NET configuration sources (appsettings.json in the
/// working folder, <c>Serimetry__</c> environment variables, command line) under the section <c>Serimetry</c>.
/// </summary>
public sealed record ServiceOptions
{
    /// <summary>
    /// Data folder: blobs/, studies/, masks/, comparisons/, incoming/, and with the sqlite store serimetry.db (metadata)
    /// and jobs.db (job queue). Nodes of one postgres store share it (a network file system with atomic rename).
    /// </summary>
    public string DataDir { get; init; } = "serimetry-data";

    /// <summary>Listening URLs (Kestrel syntax, ';'-separated).</summary>
    public string Urls { get; init; } = "http://127.0.0.1:8080";

    /// <summary>Largest request body accepted (bytes); larger uploads get 413.</summary>
    public long MaxRequestBytes { get; init; } = 2L << 30;

    /// <summary>Comparison jobs run in parallel on this node.</summary>
    public int Workers { get; init; } = 1;

    /// <summary>
    /// Seconds after which a job fetched by a node that stopped answering is handed to another worker (the job storage's
    /// invisibility timeout). On SQLite the timeout is fixed and must exceed the longest comparison (default 1800); on
    /// PostgreSQL it slides — a live node keeps its jobs by renewing it — so it is only the take-over delay after a
    /// crash (default 60).
    /// </summary>
    public int? JobTimeoutSeconds { get; init; }

    /// <summary>The job timeout in force: <see cref="JobTimeoutSeconds"/> or the default of the store.</summary>
    public int EffectiveJobTimeoutSeconds => JobTimeoutSeconds ?? (Store == "postgres" ? 60 : 1800);

    /// <summary>
    /// Where metadata and the job queue live: <c>sqlite</c> (embedded default, two files in the data folder, one node) or
    /// <c>postgres</c> (one database shared by several nodes, which also share <see cref="DataDir"/>).
    /// </summary>
    public string Store { get; init; } = "sqlite";

    /// <summary>Npgsql connection string of the postgres store (<c>Host=…;Port=…;Database=…;Username=…;Password=…</c>).</summary>
    public string? Connection { get; init; }

    /// <summary>Requests per minute allowed per API key (0: no limit); above it 429.</summary>
    public int RequestsPerMinute { get; init; } = 1200;

    /// <summary>TCP port of the DICOM receiver (C-ECHO, C-STORE; docs/dicom-network.md); 0 = no receiver.</summary>
    public int DicomPort { get; init; }

    /// <summary>Address the DICOM receiver listens on (loopback by default; 0.0.0.0 for every interface).</summary>
    public string DicomAddress { get; init; } = "127.0.0.1";

    /// <summary>Our AE title (1-16 characters).</summary>
    public string AeTitle { get; init; } = "SERIMETRY";

    /// <summary>Refuse associations addressed to another called AE title.</summary>
    public bool DicomCheckCalledAe { get; init; } = true;

    /// <summary>Calling AE titles allowed to send, comma-separated; empty = any.</summary>
    public string DicomCallingAeTitles { get; init; } = "";

    /// <summary>Associations served at the same time; more are rejected (transient) until one ends.</summary>
    public int DicomMaxAssociations { get; init; } = 8;

    /// <summary>Largest PDU accepted (bytes), announced as our maximum length; a larger PDU ends the association with A-ABORT.</summary>
    public uint DicomMaxPduBytes { get; init; } = 1 << 20;

    /// <summary>ARTIM timer (seconds): wait for the association request after connect and for the close after release.</summary>
    public int DicomArtimSeconds { get; init; } = 30;

    /// <summary>Longest silence inside an association (seconds) before it is aborted.</summary>
    public int DicomIdleSeconds { get; init; } = 300;

    /// <summary>
    /// Trigger rule: when a study received over DICOM belongs to a patient with an earlier study on file (both with a
    /// T2w series) and the baseline's gland mask is on file, queue a comparison (docs/dicom-network.md).
    /// </summary>
    public bool AutoCompare { get; init; } = true;

    /// <summary>
    /// DICOMweb root on which comparisons submitted with <c>options.storeResults</c> get their SR and SEG stored
    /// (STOW-RS) when they finish; null: such submissions are refused.
    /// </summary>
    public string? DicomWebServer { get; init; }

    /// <summary>Authorization header value for <see cref="DicomWebServer"/>, e.g. "Bearer TOKEN" (never logged).</summary>
    public string? DicomWebAuthorization { get; init; }
}
