using Serimetry.Engine.Compare;
using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Cli.Verbs;

/// <summary>
/// Exams named <c>dicomweb:&lt;StudyInstanceUID&gt;</c> on the compare command line: each is fetched from the
/// <c>--server</c> into a temporary folder, then read as any DICOM exam. Disposing removes the folders.
/// </summary>
internal sealed class DicomWebExams : IDisposable
{
    public const string Prefix = "dicomweb:";

    private readonly string? _root;

    private DicomWebExams(string? root) => _root = root;

    public static bool IsReference(string exam) => exam.StartsWith(Prefix, StringComparison.OrdinalIgnoreCase);

    /// <summary>Fetches every dicomweb: exam of the request; returns the scope and the request with local folders.</summary>
    public static (DicomWebExams Scope, CompareRequest Request) Resolve(CompareRequest request, ParsedArgs args, CliContext ctx)
    {
        var exams = new[] { request.BaselineExam }.Concat(request.FollowupExams).ToList();
        if (!exams.Any(IsReference)) return (new DicomWebExams(null), request);
        if (!args.Has("server"))
            throw new UsageException($"exams given as {Prefix}UID need --server URL (the DICOMweb root)");
        var root = Directory.CreateTempSubdirectory("serimetry-dicomweb-").FullName;
        var scope = new DicomWebExams(root);
        try
        {
            using var client = DicomWebArgs.Client(args);
            var local = new List<string>();
            foreach (var exam in exams)
            {
                if (!IsReference(exam))
                {
                    local.Add(exam);
                    continue;
                }
                var uid = exam[Prefix.Length..];
                var dir = Path.Combine(root, $"exam-{local.Count}");
                ctx.Err.WriteLine($"fetching exam {local.Count} ({Prefix}{uid})");
                var study = DicomWebArgs.Wait(DicomWebStudyFetcher.FetchAsync(client, uid, dir));
                ctx.Err.WriteLine($"fetched {study.Instances} instances in {study.Series.Count} series");
                local.Add(dir);
            }
            return (scope, request with { BaselineExam = local[0], FollowupExams = local.Skip(1).ToList() });
        }
        catch
        {
            scope.Dispose();
            throw;
        }
    }

    public void Dispose()
    {
        if (_root is not null && Directory.Exists(_root)) Directory.Delete(_root, recursive: true);
    }
}
