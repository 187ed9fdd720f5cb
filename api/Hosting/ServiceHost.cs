using Hangfire;
using Hangfire.PostgreSql;
using Hangfire.Storage.SQLite;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.Configuration;
using Serimetry.Api.Dicom;
using Serimetry.Api.Endpoints;
using Serimetry.Api.Intake;
using Serimetry.Api.Jobs;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Api.Hosting;

/// <summary>
/// Composes the HTTP service: configuration (appsettings.json, environment variables, command line; section
/// <c>Serimetry</c>), the metadata store and Hangfire job storage (both SQLite in the data folder, or both one shared
/// PostgreSQL database for several nodes), API-key middleware, problem details, and one endpoint group per resource.
/// </summary>
public static class ServiceHost
{
    /// <summary>Command-line switches mapped onto configuration keys.</summary>
    public static readonly IReadOnlyDictionary<string, string> Switches = new Dictionary<string, string>
    {
        ["--data"] = "Serimetry:DataDir", ["--urls"] = "Serimetry:Urls", ["--max-request-bytes"] = "Serimetry:MaxRequestBytes",
        ["--workers"] = "Serimetry:Workers", ["--job-timeout"] = "Serimetry:JobTimeoutSeconds",
        ["--rate-limit"] = "Serimetry:RequestsPerMinute", ["--store"] = "Serimetry:Store", ["--connection"] = "Serimetry:Connection",
        ["--dicom-port"] = "Serimetry:DicomPort", ["--ae-title"] = "Serimetry:AeTitle", ["--dicom-address"] = "Serimetry:DicomAddress",
        ["--dicom-check-called-ae"] = "Serimetry:DicomCheckCalledAe", ["--dicom-calling-aes"] = "Serimetry:DicomCallingAeTitles",
        ["--auto-compare"] = "Serimetry:AutoCompare", ["--dicomweb-server"] = "Serimetry:DicomWebServer",
        ["--dicomweb-auth"] = "Serimetry:DicomWebAuthorization",
    };

    /// <summary>Reads <see cref="ServiceOptions"/> from the configuration sources and <paramref name="args"/>.</summary>
    public static ServiceOptions ReadOptions(string[] args)
    {
        var config = new ConfigurationBuilder().AddJsonFile(Path.GetFullPath("appsettings.json"), optional: true)
            .AddEnvironmentVariables().AddCommandLine(args, new Dictionary<string, string>(Switches)).Build();
        return config.GetSection("Serimetry").Get<ServiceOptions>() ?? new ServiceOptions();
    }

    /// <summary>Builds the service for <paramref name="options"/> (not started).</summary>
    public static WebApplication Build(ServiceOptions options)
    {
        var builder = WebApplication.CreateSlimBuilder(new WebApplicationOptions { ContentRootPath = AppContext.BaseDirectory });
        builder.WebHost.UseUrls(options.Urls.Split(';', StringSplitOptions.RemoveEmptyEntries));
        builder.WebHost.ConfigureKestrel(k => k.Limits.MaxRequestBodySize = options.MaxRequestBytes);
        ConfigureLogging(builder.Logging);
        Validate(options);
        var paths = new DataPaths(options.DataDir);
        var store = MetadataStore.Open(options, paths);
        ScratchCleanup.RemoveStale(paths, TimeSpan.FromHours(1));
        builder.Services.AddSingleton(options).AddSingleton(paths).AddSingleton(store)
            .AddSingleton<BlobStore>().AddSingleton<StudyIntake>().AddTransient<ComparisonJob>().AddTransient<CallbackJob>()
            .AddTransient<ResultStoreJob>();
        builder.Services.Configure<RouteHandlerOptions>(o => o.ThrowOnBadRequest = true);
        builder.Services.ConfigureHttpJsonOptions(o => o.SerializerOptions.PropertyNamingPolicy = System.Text.Json.JsonNamingPolicy.CamelCase);
        builder.Services.AddOpenApi();
        AddJobs(builder.Services, paths, options);
        if (options.DicomPort > 0) DicomReceiverService.Add(builder.Services);
        KeyRateLimit.Add(builder.Services, options.RequestsPerMinute);

        // Options validated at start-up: a wrong DICOMweb URL or Authorization value stops the service with a clear error.
        if (options.DicomWebServer is not null) DicomWebOptions.Create(options.DicomWebServer, options.DicomWebAuthorization);
        var app = builder.Build();
        app.UseExceptionHandler(new ExceptionHandlerOptions { ExceptionHandler = Problems.HandleException });
        app.UseStatusCodePages(ctx => ctx.HttpContext.Response.HasStarted ? Task.CompletedTask
            : Problems.Write(ctx.HttpContext, ctx.HttpContext.Response.StatusCode, "http-" + ctx.HttpContext.Response.StatusCode, "Request failed", null));
        app.Use(ApiKeyMiddleware.Invoke);
        app.UseRateLimiter();
        MapEndpoints(app);
        return app;
    }

    /// <summary>Reads the options and runs the service until it is stopped (Ctrl+C, SIGTERM).</summary>
    public static void Run(string[] args) => Build(ReadOptions(args)).Run();

    private static void ConfigureLogging(ILoggingBuilder logging)
    {
        logging.ClearProviders();
        logging.AddSimpleConsole(o => { o.SingleLine = true; o.TimestampFormat = "yyyy-MM-ddTHH:mm:ss "; });
        // Request logs carry URLs (/v1/patients/{id}/...) and exception logs carry engine messages that may quote
        // header values: both are off so no patient identifier reaches the log. The service logs ids itself.
        logging.AddFilter("Microsoft.AspNetCore", LogLevel.Warning);
        logging.AddFilter("Microsoft.AspNetCore.Diagnostics", LogLevel.None);
        logging.AddFilter("Microsoft.AspNetCore.Server.Kestrel", LogLevel.Error);
        logging.AddFilter("Hangfire.Storage.SQLite.ExpirationManager", LogLevel.Warning);
        logging.AddFilter("Hangfire.PostgreSql.ExpirationManager", LogLevel.Warning);
    }

    /// <summary>Settings checked before anything is opened (the store checks its own: <see cref="MetadataStore.Open"/>).</summary>
    private static void Validate(ServiceOptions o)
    {
        if (o.Workers < 1) throw new InvalidParameterException($"workers must be at least 1, got {o.Workers}", "Serimetry:Workers", "pass --workers 1 or more");
        if (o.EffectiveJobTimeoutSeconds < 1)
            throw new InvalidParameterException($"job timeout must be at least 1 s, got {o.EffectiveJobTimeoutSeconds}", "Serimetry:JobTimeoutSeconds",
                "pass --job-timeout SECONDS");
    }

    private static void AddJobs(IServiceCollection services, DataPaths paths, ServiceOptions options)
    {
        var timeout = TimeSpan.FromSeconds(options.EffectiveJobTimeoutSeconds);
        services.AddHangfire(c =>
        {
            c.SetDataCompatibilityLevel(CompatibilityLevel.Version_180).UseSimpleAssemblyNameTypeSerializer().UseRecommendedSerializerSettings();
            if (options.Store == "postgres")
                // Sliding invisibility: a live node renews the fetch time of its running jobs, so a long comparison is never
                // handed out twice, while a job of a crashed node is fetched again by another node once the timeout passes.
                c.UsePostgreSqlStorage(b => b.UseNpgsqlConnection(options.Connection), new PostgreSqlStorageOptions
                {
                    QueuePollInterval = TimeSpan.FromSeconds(1),
                    InvisibilityTimeout = timeout,
                    UseSlidingInvisibilityTimeout = true,
                    DistributedLockTimeout = TimeSpan.FromSeconds(30),
                    PrepareSchemaIfNecessary = true,
                });
            else
                c.UseSQLiteStorage(paths.JobsDb, new SQLiteStorageOptions
                {
                    QueuePollInterval = TimeSpan.FromSeconds(1),
                    InvisibilityTimeout = timeout,
                    DistributedLockLifetime = TimeSpan.FromSeconds(30),
                });
        });
        services.AddHangfireServer(o =>
        {
            o.WorkerCount = options.Workers;
            o.SchedulePollingInterval = TimeSpan.FromSeconds(1);
            // Host and process: several nodes (and several nodes per host) tell apart in the job history.
            o.ServerName = $"serimetry-{Environment.MachineName}-{Environment.ProcessId}";
        });
    }

    private static void MapEndpoints(WebApplication app)
    {
        app.MapGet("/health", () => Results.Json(new { status = "ok", name = SoftwareInfo.Name, version = SoftwareInfo.Version })).WithName("health");
        app.MapOpenApi("/openapi.json");
        StudyEndpoints.Map(app);
        MaskEndpoints.Map(app);
        ComparisonEndpoints.Map(app);
        PatientEndpoints.Map(app);
    }
}
