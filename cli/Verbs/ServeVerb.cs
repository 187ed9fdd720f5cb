using Serimetry.Api.Hosting;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry serve</c>: hosts the HTTP service (docs/service.md); the verb only forwards its options.</summary>
internal sealed class ServeVerb : IVerb
{
    public VerbSpec Spec { get; } = new("serve",
        "Run the HTTP service (study intake, durable comparison jobs, results; docs/service.md) and optionally the DICOM receiver",
        "[--urls URL] [--data DIR] [--store sqlite|postgres --connection CONN] [--max-request-bytes N] [--workers N] [--job-timeout SECONDS] [--rate-limit N] " +
        "[--dicom-port PORT] [--ae-title TITLE] [--dicom-address IP] [--dicom-check-called-ae true|false] [--dicom-calling-aes A,B] [--auto-compare true|false] [--dicomweb-server URL]",
        [
            new("urls", "URL", "listening URLs, ';'-separated (default http://127.0.0.1:8080)"),
            new("data", "DIR", "data folder: databases, stored studies and results (default ./serimetry-data)"),
            new("store", "KIND", "sqlite (default: one node, databases in the data folder) or postgres (several nodes on one database)"),
            new("connection", "CONN", "PostgreSQL connection string (Host=...;Port=...;Database=...;Username=...;Password=...)"),
            new("max-request-bytes", "N", "largest upload accepted; larger ones get 413 (default 2 GiB)"),
            new("workers", "N", "comparison jobs run in parallel on this node (default 1)"),
            new("job-timeout", "SECONDS", "after this a job of a vanished node is run again (default 1800 on sqlite, 60 on postgres)"),
            new("rate-limit", "N", "requests per minute per API key; 0 = no limit (default 1200)"),
            new("dicom-port", "PORT", "run the DICOM receiver (C-ECHO, C-STORE) on this TCP port; 0 = off (default 0; docs/dicom-network.md)"),
            new("ae-title", "TITLE", "AE title of the DICOM receiver (default SERIMETRY)"),
            new("dicom-address", "IP", "address the DICOM receiver listens on (default 127.0.0.1; 0.0.0.0 for every interface)"),
            new("dicom-check-called-ae", "BOOL", "refuse associations addressed to another AE title (default true)"),
            new("dicom-calling-aes", "LIST", "comma-separated calling AE titles allowed to send; empty = any (default)"),
            new("auto-compare", "BOOL", "queue a comparison when a received study follows an earlier one of the patient with baseline masks on file (default true)"),
            new("dicomweb-server", "URL", "DICOMweb root where comparisons with options.storeResults get their SR and SEG stored (STOW-RS)"),
            new("dicomweb-auth", "HEADER", "Authorization value for --dicomweb-server (better: Serimetry__DicomWebAuthorization in the environment)"),
        ],
        Details: "Settings also come from appsettings.json (section \"Serimetry\") and environment variables (Serimetry__DataDir, Serimetry__Connection, ...).");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        ServiceHost.Run(Forward(args));
        return CliHost.ExitOk;
    }

    /// <summary>The verb's options as configuration command-line switches.</summary>
    internal static string[] Forward(ParsedArgs args)
    {
        var list = new List<string>();
        foreach (var name in ServiceHost.Switches.Keys)
            if (args.Get(name[2..]) is string v) list.AddRange([name, v]);
        return [.. list];
    }
}
