using System.Net;
using System.Net.Sockets;
using Microsoft.Extensions.Hosting;
using Serimetry.Api.Hosting;
using Serimetry.Api.Storage;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Network;

namespace Serimetry.Api.Dicom;

/// <summary>
/// Hosts the engine's storage SCP (<see cref="StorageScpListener"/>) inside <c>serimetry serve</c> when a DICOM port is
/// configured. The port is bound at start, so a port in use stops the service with a clear error.
/// </summary>
internal sealed class DicomReceiverService(ServiceOptions options, DataPaths paths, ReceivedStudyIndexer indexer,
    ILogger<DicomReceiverService> log) : IHostedService
{
    private readonly CancellationTokenSource _stop = new();
    private TcpListener? _tcp;
    private Task? _loop;

    /// <summary>Registers the receiver, its study indexer and the trigger rule.</summary>
    public static void Add(IServiceCollection services) =>
        services.AddSingleton<ComparisonTrigger>().AddSingleton<ReceivedStudyIndexer>().AddHostedService<DicomReceiverService>();

    /// <summary>The engine settings from the service options.</summary>
    internal static StorageScpOptions ScpOptions(ServiceOptions o, DataPaths paths) => new()
    {
        AeTitle = o.AeTitle,
        CheckCalledAeTitle = o.DicomCheckCalledAe,
        AllowedCallingAeTitles = o.DicomCallingAeTitles.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries),
        MaxPduLength = o.DicomMaxPduBytes,
        MaxAssociations = o.DicomMaxAssociations,
        ArtimTimeout = TimeSpan.FromSeconds(o.DicomArtimSeconds),
        IdleTimeout = TimeSpan.FromSeconds(o.DicomIdleSeconds),
        ScratchDirectory = paths.Incoming,
    };

    public Task StartAsync(CancellationToken cancellationToken)
    {
        var scp = new StorageScpListener(ScpOptions(options, paths), indexer);
        if (!IPAddress.TryParse(options.DicomAddress, out var address))
            throw new InvalidParameterException($"DICOM address '{options.DicomAddress}' is not an IP address", "Serimetry:DicomAddress",
                "use 127.0.0.1 (this machine only) or 0.0.0.0 (every interface)");
        _tcp = new TcpListener(address, options.DicomPort);
        _tcp.Start();
        log.LogInformation("DICOM receiver {AeTitle} listening on {Address}:{Port}", options.AeTitle, options.DicomAddress, options.DicomPort);
        _loop = scp.RunAsync(_tcp, _stop.Token);
        return Task.CompletedTask;
    }

    public async Task StopAsync(CancellationToken cancellationToken)
    {
        _stop.Cancel();
        _tcp?.Stop();
        if (_loop is not null) await _loop.WaitAsync(cancellationToken);
    }
}
