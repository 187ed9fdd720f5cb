using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.AspNetCore.WebUtilities;
using Microsoft.Net.Http.Headers;
using Serimetry.Api.Hosting;
using Serimetry.Api.Intake;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using Serimetry.Engine;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Api.Endpoints;

/// <summary><c>/v1/studies</c>: study intake (zip of DICOM files or NIfTI exam; DICOMweb STOW-RS style multipart/related, PS3.18 §10.5).</summary>
internal static class StudyEndpoints
{
    public static void Map(IEndpointRouteBuilder app)
    {
        var g = app.MapGroup("/v1/studies");
        g.MapPost("/", Create).WithName("createStudy").Accepts<IFormFile>("application/zip", "multipart/related");
        g.MapGet("/{id}", Get).WithName("getStudy");
    }

    private static async Task<IResult> Create(HttpRequest req, StudyIntake intake, MetadataStore store, DataPaths paths, ILogger<StudyIntake> log)
    {
        // The upload is spooled to a scratch folder of its own and streamed from there: no file is held in memory.
        string scratch = Path.Combine(paths.Incoming, "upload-" + Guid.NewGuid().ToString("N"));
        try
        {
            var files = await ReadFiles(req, scratch);
            if (files is null) return Problems.Result(Problems.Document(415, "unsupported-media-type", "Unsupported media type",
                "send application/zip or multipart/related; type=\"application/dicom\""));
            var study = intake.Ingest(files, moveFiles: true);
            store.Audit(req.HttpContext.KeyName(), "submit-study", study.Id);
            log.LogInformation("study {StudyId} stored ({Kind}, {Files} files)", study.Id, study.Kind, files.Count);
            return Results.Json(Describe(study), statusCode: 201);
        }
        finally
        {
            try { if (Directory.Exists(scratch)) Directory.Delete(scratch, recursive: true); }
            catch (IOException) { } // in use elsewhere: ScratchCleanup removes it later
        }
    }

    private static IResult Get(string id, HttpContext ctx, MetadataStore store)
    {
        var s = store.FindStudy(id);
        if (s is null) return Problems.NotFound("study", id);
        store.Audit(ctx.KeyName(), "fetch-study", id);
        return Results.Json(Describe(s));
    }

    internal static JsonObject Describe(StudyRecord s) => new()
    {
        ["studyId"] = s.Id, ["patientId"] = s.PatientId, ["studyDate"] = s.StudyDate, ["kind"] = s.Kind,
        ["series"] = JsonNode.Parse(s.SeriesJson), ["caution"] = SoftwareInfo.Caution,
    };

    private static async Task<IReadOnlyList<IntakeFile>?> ReadFiles(HttpRequest req, string scratch)
    {
        var type = MediaTypeHeaderValue.TryParse(req.ContentType, out var mt) ? mt.MediaType.Value : null;
        if (type is "application/zip" or "application/x-zip-compressed") return await ReadZip(req, scratch);
        if (type is "multipart/related") return await ReadMultipart(req, mt!, scratch);
        return null;
    }

    private static async Task<IReadOnlyList<IntakeFile>> ReadZip(HttpRequest req, string scratch)
    {
        Directory.CreateDirectory(scratch);
        string zip = Path.Combine(scratch, "upload.zip");
        await using (var f = File.Create(zip)) await req.Body.CopyToAsync(f, req.HttpContext.RequestAborted);
        return SafeZip.Extract(zip, ZipLimits.Default, Path.Combine(scratch, "entries"));
    }

    private static async Task<IReadOnlyList<IntakeFile>> ReadMultipart(HttpRequest req, MediaTypeHeaderValue mt, string scratch)
    {
        var boundary = HeaderUtilities.RemoveQuotes(mt.Boundary).Value;
        if (string.IsNullOrEmpty(boundary)) throw new BadHttpRequestException("multipart/related needs a boundary parameter");
        Directory.CreateDirectory(scratch);
        var reader = new MultipartReader(boundary, req.Body);
        var files = new List<IntakeFile>();
        while (await reader.ReadNextSectionAsync(req.HttpContext.RequestAborted) is { } section)
        {
            string name = $"part-{files.Count + 1:D5}.dcm", path = Path.Combine(scratch, name);
            await using (var f = File.Create(path)) await section.Body.CopyToAsync(f, req.HttpContext.RequestAborted);
            files.Add(new IntakeFile(name, path));
        }
        return files;
    }
}
