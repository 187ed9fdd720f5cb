using System.Globalization;
using System.Security.Cryptography;
using Serimetry.Engine.Io.Dicom.Codecs;
using Xunit;

namespace Serimetry.Conformance.Codecs;

/// <summary>
/// Decodes the compressed files of the reference corpus with the engine's codecs and compares them with the
/// pixel statistics that dcmtk and GDCM decodes gave (Src: shared/reference/dicom/manifest.csv, dcmtk 3.6.7
/// and GDCM decodes; for JLSL_08_07_0_1F.dcm GDCM only).
/// </summary>
public class ReferenceFileDecodeTests
{
    public static TheoryData<string> Files =>
    [
        "MR_small_RLE.dcm", "emri_small_RLE.dcm",
        "JPEG-LL.dcm", "JPEGLossless_1s_1f_u_16_12.dcm", "JPGLosslessP14SV1_1s_1f_8b.dcm",
        "MR_small_jpeg_ls_lossless.dcm", "emri_small_jpeg_ls_lossless.dcm", "JLSL_08_07_0_1F.dcm", "JLSL_16_15_1_1F.dcm",
    ];

    [Theory]
    [MemberData(nameof(Files))]
    public void DecodedValuesMatchManifest(string file)
    {
        var row = ReferenceManifest.Row(file);
        var info = row.Info();
        int frames = row.Int("number_of_frames", 1);
        var decoder = CodecRegistry.Find(row["transfer_syntax_uid"]);
        Assert.NotNull(decoder);

        var fragments = PixelDataReader.Frames(ReferenceManifest.FilePath(file), frames);
        Assert.Equal(frames, fragments.Count);
        var all = new byte[info.DecodedLength * frames];
        for (int f = 0; f < frames; f++)
            decoder.Decode(fragments[f], info, all.AsSpan(f * info.DecodedLength, info.DecodedLength));

        // Raw buffer as dcmtk/GDCM return it, then the stored-value convention of the manifest.
        Assert.Equal(row["all_frames_sha256"], Convert.ToHexStringLower(SHA256.HashData(all)));
        int bitsAllocated = info.BitsAllocated;
        var first = StoredValues.Extract(all.AsSpan(0, info.DecodedLength), bitsAllocated, info.BitsStored, row.Int("high_bit"), info.PixelRepresentation);
        var every = StoredValues.Extract(all, bitsAllocated, info.BitsStored, row.Int("high_bit"), info.PixelRepresentation);
        Assert.Equal(row["frame1_values_sha256"], StoredValues.Sha256(first, bitsAllocated));
        Assert.Equal(row["all_frames_values_sha256"], StoredValues.Sha256(every, bitsAllocated));
        Assert.Equal(long.Parse(row["frame1_min"], CultureInfo.InvariantCulture), first.Min());
        Assert.Equal(long.Parse(row["frame1_max"], CultureInfo.InvariantCulture), first.Max());
        double mean = double.Parse(row["frame1_mean"], CultureInfo.InvariantCulture);
        Assert.Equal(mean, first.Average(), Math.Abs(mean) * 1e-5 + 1e-3); // manifest prints 6 significant digits
    }
}
