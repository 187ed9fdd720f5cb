using System.Security.Cryptography;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Serimetry.Api.Hosting;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Masks;

namespace Serimetry.Api.Endpoints;

/// <summary>
/// <c>/v1/masks</c>: outline upload for a stored study — a NIfTI-1 (.nii or .nii.gz), DICOM SEG or RTSTRUCT body;
/// <c>segment=</c> picks a segment / ROI (number or label) or a NIfTI label (docs/masks.md); an optional role
/// (gland or lesion) lets the DICOM trigger rule find the baseline outlines.
/// </summary>
internal static class MaskEndpoints
{
    public static void Map(IEndpointRouteBuilder app)
    {
        var g = app.MapGroup("/v1/masks");
        g.MapPost("/", Create).WithName("createMask").Accepts<byte[]>("application/octet-stream", "application/dicom");
    }

    private static async Task<IResult> Create(string? studyId, string? segment, string? role, HttpRequest req, MetadataStore store, DataPaths paths)
    {
        if (studyId is null || store.FindStudy(studyId) is null) return Problems.NotFound("study", studyId ?? "");
        if (role is not (null or "gland" or "lesion")) return Problems.BadRequest($"role must be gland or lesion, got '{role}'");
        if (segment is not null && (segment.Length is 0 or > 64 || segment.Any(c => c == '#' || char.IsControl(c))))
            throw new InvalidParameterException("segment must be 1 to 64 characters without '#'", "segment", "give a segment number or label");
        using var ms = new MemoryStream();
        await req.Body.CopyToAsync(ms, req.HttpContext.RequestAborted);
        var data = ms.ToArray();
        string ext = Extension(data);
        string id = Convert.ToHexStringLower(SHA256.HashData([.. data, .. Encoding.UTF8.GetBytes("#" + segment)]))[..32];
        string file = id + ext;
        string path = Path.Combine(paths.Masks, file);
        if (!File.Exists(path))
        {
            string tmp = Path.Combine(paths.Incoming, "mask-" + Guid.NewGuid().ToString("N") + ext);
            await File.WriteAllBytesAsync(tmp, data);
            try { MaskFiles.Describe(tmp, segment); }
            catch { File.Delete(tmp); throw; }
            File.Move(tmp, path, overwrite: true);
        }
        store.AddMask(new MaskRecord(id, studyId, segment is null ? file : file + "#" + segment, role));
        store.Audit(req.HttpContext.KeyName(), "submit-mask", id);
        return Results.Json(new { maskId = id, studyId, role }, statusCode: 201);
    }

    /// <summary>.nii.gz for gzip, .dcm for a DICOM Part 10 file ("DICM" at byte 128, PS3.10 7.1), else .nii.</summary>
    private static string Extension(byte[] data)
    {
        if (data.Length > 2 && data[0] == 0x1f && data[1] == 0x8b) return ".nii.gz";
        if (data.Length > 132 && data.AsSpan(128, 4).SequenceEqual("DICM"u8)) return ".dcm";
        return ".nii";
    }
}
