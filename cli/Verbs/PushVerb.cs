using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry push --server URL FILE…</c>: stores DICOM Part 10 files on a DICOMweb server (STOW-RS).</summary>
internal sealed class PushVerb : IVerb
{
    public VerbSpec Spec { get; } = new("push",
        "Store DICOM files on a DICOMweb server (STOW-RS), e.g. a comparison's sr.dcm and seg-<visit>.dcm",
        "--server URL [--auth HEADER] FILE|DIR…",
        [DicomWebArgs.Server(required: true), DicomWebArgs.Auth, DicomWebArgs.Timeout],
        MinPositionals: 1, MaxPositionals: int.MaxValue,
        Details: "A folder sends every DICOM file under it (other files are skipped); a file given by name must be DICOM.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        using var client = DicomWebArgs.Client(args);
        var files = Expand(args.Positionals);
        var result = DicomWebArgs.Wait(client.StoreAsync(files));
        ctx.Out.WriteLine($"stored {result.Stored} of {files.Count} instances");
        return CliHost.ExitOk;
    }

    internal static IReadOnlyList<string> Expand(IEnumerable<string> paths)
    {
        var files = new List<string>();
        foreach (var p in paths)
        {
            if (Directory.Exists(p))
                files.AddRange(Directory.EnumerateFiles(p, "*", SearchOption.AllDirectories).Order(StringComparer.Ordinal)
                    .Where(Engine.Io.Series.DicomSniffer.FileLooksLikeDicom));
            else if (File.Exists(p)) files.Add(p);
            else throw new InvalidParameterException("no such file or folder", p, "give DICOM files or folders holding them");
        }
        if (files.Count == 0) throw new InvalidParameterException("no DICOM files found", string.Join(' ', paths), "give DICOM files or folders holding them");
        return files;
    }
}
