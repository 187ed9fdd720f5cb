using System.Net;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Api.Tests;

/// <summary>
/// <c>POST /v1/masks</c> with DICOM SEG and RTSTRUCT bodies (docs/masks.md): a segment / ROI is chosen with
/// <c>segment=</c>; an ambiguous or unknown choice and a non-mask DICOM object are refused as problem details.
/// </summary>
public sealed class MaskUploadTests : IDisposable
{
    private readonly string _data = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_data);

    [Fact]
    public async Task Seg_and_rtstruct_uploads_are_checked_and_stored()
    {
        var gland = NiftiFile.ReadMask(Path.Combine(PhantomStudies.Visit(0), "masks", "gland.nii.gz"));
        var lesion = NiftiFile.ReadMask(Path.Combine(PhantomStudies.Visit(0), "masks", "lesion.nii.gz"));
        var study = new DicomStudyInfo("X", null, null, new DateOnly(2022, 3, 14));
        var seg = DicomPart10Writer.ToBytes(SegmentationWriter.Build(gland.Geometry,
        [
            new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "MANUAL", null, gland),
            new SegmentDefinition("Lesion", DicomCode.MorphologicallyAlteredStructure, DicomCode.Neoplasm, "MANUAL", null, lesion),
        ], study, null));
        var rt = DicomPart10Writer.ToBytes(RtStructWriter.Build(gland.Geometry, [new RoiDefinition("Prostate", gland)], study, null));

        string key = ServiceProcess.CreateKey(_data, "masks");
        using var service = await ServiceProcess.Start(_data);
        using var api = new ApiClient(service.BaseUrl, key);
        var created = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, "/v1/studies", ApiClient.Bytes(PhantomStudies.VisitZip(0), "application/zip"));
        string b = (string)created["studyId"]!;

        var ambiguous = await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, $"/v1/masks?studyId={b}", ApiClient.Bytes(seg, "application/dicom"));
        Assert.Equal("urn:serimetry:problem:input-parameter", (string?)ambiguous["type"]);
        Assert.Contains("1 'Prostate', 2 'Lesion'", (string?)ambiguous["detail"] ?? "", StringComparison.Ordinal);
        await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, $"/v1/masks?studyId={b}&segment=Urethra", ApiClient.Bytes(seg, "application/dicom"));

        var l = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={b}&segment=Lesion", ApiClient.Bytes(seg, "application/dicom"));
        var g = await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={b}&segment=1", ApiClient.Bytes(seg, "application/dicom"));
        Assert.NotEqual((string?)l["maskId"], (string?)g["maskId"]); // same file, different segment: two masks
        await api.Expect(HttpStatusCode.Created, HttpMethod.Post, $"/v1/masks?studyId={b}", ApiClient.Bytes(rt, "application/dicom"));

        // A DICOM object that is not a mask (the SEG with another SOP Class UID): PS3.4 B.5 lists the storage classes.
        var notMask = (byte[])seg.Clone();
        var text = System.Text.Encoding.ASCII.GetBytes("1.2.840.10008.5.1.4.1.1.66.4");
        for (int at = notMask.AsSpan().IndexOf(text); at >= 0; at = notMask.AsSpan().IndexOf(text))
            notMask[at + text.Length - 1] = (byte)'5'; // 1.2.840.10008.5.1.4.1.1.66.5 (Surface Segmentation), in meta and data set
        var refused = await api.Expect(HttpStatusCode.UnprocessableEntity, HttpMethod.Post, $"/v1/masks?studyId={b}", ApiClient.Bytes(notMask, "application/dicom"));
        Assert.Equal("urn:serimetry:problem:input-unsupported", (string?)refused["type"]);
    }
}
