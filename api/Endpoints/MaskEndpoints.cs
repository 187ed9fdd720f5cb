using System.Security.Cryptography;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Serimetry.Api.Hosting;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Api.Endpoints;

/// <summary><c>/v1/masks</c>: outline upload (NIfTI-1, .nii or .nii.gz body) for a stored study, with an optional role (gland or lesion).</summary>
internal static class MaskEndpoints
{
    public static void Map(IEndpointRouteBuilder app)
    {
        var g = app.MapGroup("/v1/masks");
        g.MapPost("/", Create).WithName("createMask").Accepts<byte[]>("application/octet-stream");
    }

    private static async Task<IResult> Create(string? studyId, string? role, HttpRequest req, MetadataStore store, DataPaths paths)
    {
        if (studyId is null || store.FindStudy(studyId) is null) return Problems.NotFound("study", studyId ?? "");
        if (role is not (null or "gland" or "lesion")) return Problems.BadRequest($"role must be gland or lesion, got '{role}'");
        using var ms = new MemoryStream();
        await req.Body.CopyToAsync(ms, req.HttpContext.RequestAborted);
        var data = ms.ToArray();
        bool gz = data.Length > 2 && data[0] == 0x1f && data[1] == 0x8b;
        string id = Convert.ToHexStringLower(SHA256.HashData(data))[..32];
        string file = id + (gz ? ".nii.gz" : ".nii");
        string path = Path.Combine(paths.Masks, file);
        if (!File.Exists(path))
        {
            string tmp = Path.Combine(paths.Incoming, "mask-" + Guid.NewGuid().ToString("N") + (gz ? ".nii.gz" : ".nii"));
            await File.WriteAllBytesAsync(tmp, data);
            try { NiftiFile.ReadMask(tmp); }
            catch { File.Delete(tmp); throw; }
            File.Move(tmp, path, overwrite: true);
        }
        store.AddMask(new MaskRecord(id, studyId, file, role));
        store.Audit(req.HttpContext.KeyName(), "submit-mask", id);
        return Results.Json(new { maskId = id, studyId, role }, statusCode: 201);
    }
}
