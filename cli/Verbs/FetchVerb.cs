using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// <c>serimetry fetch --server URL --study UID --out DIR</c>: pulls one study from a DICOMweb server (QIDO-RS, then
/// WADO-RS per series) into a folder that <c>compare</c> reads as a DICOM exam (<see cref="DicomWebStudyFetcher"/>).
/// </summary>
internal sealed class FetchVerb : IVerb
{
    public VerbSpec Spec { get; } = new("fetch",
        "Fetch a study from a DICOMweb server (QIDO-RS + WADO-RS) into a folder",
        "--server URL --study UID --out DIR [--auth HEADER] [--timeout SECONDS]",
        [
            DicomWebArgs.Server(required: true),
            new("study", "UID", "Study Instance UID to fetch", Required: true),
            new("out", "DIR", "new or empty folder; gets one sub-folder per series", Required: true),
            DicomWebArgs.Auth,
            DicomWebArgs.Timeout,
        ],
        Details: "Instances are asked for uncompressed (Explicit VR Little Endian); when the server cannot transcode, it is asked for\n" +
                 "any transfer syntax and the engine decodes RLE, JPEG Lossless and JPEG-LS itself. The folder is then an exam for compare.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        using var client = DicomWebArgs.Client(args);
        var study = DicomWebArgs.Wait(DicomWebStudyFetcher.FetchAsync(client, args.Required("study"), args.Required("out"),
            DicomWebArgs.Lines(ctx.Err, "fetching ")));
        foreach (var s in study.Series)
            ctx.Out.WriteLine($"series {s.SeriesInstanceUid} {s.Modality ?? "?"}: {s.Instances} instances" +
                              (s.RequestedTransferSyntax == DicomWebClient.AnyTransferSyntax ? " (server's own transfer syntax)" : ""));
        ctx.Out.WriteLine($"fetched {study.Instances} instances in {study.Series.Count} series to {study.Directory}");
        return CliHost.ExitOk;
    }
}
