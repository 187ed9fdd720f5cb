using Xunit;
using System.Globalization;
using System.Security.Cryptography;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Codecs;

namespace Serimetry.Conformance.Dicom;

/// <summary>
/// Our decoded stored values against the reference manifest. Src: dcmtk 3.6.7 and GDCM 3.0.21 decodes
/// of shared/reference/dicom (manifest.csv, conventions in its README).
/// </summary>
public sealed class DicomPixelConformanceTests
{
    public static TheoryData<string> Files() => DicomReferenceCorpus.ManifestNames();

    [Theory]
    [MemberData(nameof(Files))]
    public void Frame1_stats_and_all_frames_hash_equal_the_manifest(string name)
    {
        var (path, row) = DicomReferenceCorpus.ManifestOf(name);
        var file = DicomFile.ReadHeader(path);
        if (row["frame1_min"].Length == 0)
        {
            // No decodable image in the reference: reading the header must still succeed.
            Assert.NotNull(file.Dataset);
            return;
        }
        var ts = file.TransferSyntax;
        if (ts.Encapsulated && CodecRegistry.Find(ts.Uid) is null)
        {
            var ex = Assert.Throws<UnsupportedInputException>(() => file.GetPixelData());
            Assert.Contains(ts.Uid, ex.Message);
            Assert.Contains(ts.Name, ex.Message);
            Assert.Contains("gdcmconv --raw", ex.Fix);
            return;
        }
        var px = file.GetPixelData();
        var stats = DicomFileSummary.ComputeStats(px, 0);
        Assert.Equal(long.Parse(row["frame1_min"], CultureInfo.InvariantCulture), stats.Min);
        Assert.Equal(long.Parse(row["frame1_max"], CultureInfo.InvariantCulture), stats.Max);
        Assert.Equal(double.Parse(row["frame1_mean"], CultureInfo.InvariantCulture),
            double.Parse(DicomFileSummary.FormatMean(stats.Mean), CultureInfo.InvariantCulture));
        Assert.Equal(row["frame1_values_sha256"], stats.Sha256);
        Assert.Equal(row["all_frames_values_sha256"], AllFramesValuesHash(px));
        var frames = row["number_of_frames"].Length == 0 ? 1 : int.Parse(row["number_of_frames"], CultureInfo.InvariantCulture);
        Assert.Equal(frames, px.FrameCount);
    }

    [Theory]
    [MemberData(nameof(Files))]
    public void Transfer_syntax_and_dataset_encoding_equal_dcmtk(string name)
    {
        var (path, row) = DicomReferenceCorpus.ManifestOf(name);
        var file = DicomFile.ReadHeader(path);
        if (row["transfer_syntax_uid"].Length > 0)
        {
            Assert.True(file.HasFileMeta);
            Assert.Equal(row["transfer_syntax_uid"], file.TransferSyntaxUid);
        }
        else
        {
            // Src: dcmtk's "Used TransferSyntax" for files without File Meta.
            Assert.False(file.HasFileMeta);
            var expected = row["dataset_encoding_dcmtk"] switch
            {
                "Little Endian Implicit" => DicomTransferSyntax.ImplicitVRLittleEndian,
                "Big Endian Explicit" => DicomTransferSyntax.ExplicitVRBigEndian,
                _ => DicomTransferSyntax.ExplicitVRLittleEndian,
            };
            Assert.Equal(expected, file.TransferSyntaxUid);
        }
        Assert.Equal(row["sop_class_uid"], file.Dataset.GetStringOrNull(DicomTags.SOPClassUID) ?? "");
    }

    [Theory]
    [MemberData(nameof(Files))]
    public void Header_only_read_equals_full_read(string name)
    {
        var (path, _) = DicomReferenceCorpus.ManifestOf(name);
        var header = DicomFile.ReadHeader(path);
        var full = DicomFile.Read(path);
        Assert.Equal(header.PixelDataLocation?.Offset, full.PixelDataLocation?.Offset);
        var pixelTag = new DicomTag(0x7FE0, 0x0010);
        var fullTags = full.Dataset.Elements.Select(e => e.Tag).TakeWhile(t => t != pixelTag).ToArray();
        Assert.Equal(fullTags, header.Dataset.Elements.Select(e => e.Tag).ToArray());
        if (!full.HasPixelData || !full.Dataset.Contains(DicomTags.Rows)) return;
        var ts = full.TransferSyntax;
        if (ts.Encapsulated && CodecRegistry.Find(ts.Uid) is null) return;
        var a = full.GetPixelData();
        var b = header.GetPixelData();
        for (var f = 0; f < a.FrameCount; f++) Assert.Equal(a.GetFrameBytes(f), b.GetFrameBytes(f));
    }

    internal static string AllFramesValuesHash(DicomPixelData px)
    {
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        var width = px.Info.BitsAllocated == 1 ? 1 : px.Info.BitsAllocated / 8;
        for (var f = 0; f < px.FrameCount; f++)
        {
            var values = px.GetStoredValues(f);
            var bytes = new byte[values.Length * width];
            for (var i = 0; i < values.Length; i++)
                for (var b = 0; b < width; b++) bytes[i * width + b] = (byte)(values[i] >> (8 * b));
            sha.AppendData(bytes);
        }
        return Convert.ToHexStringLower(sha.GetHashAndReset());
    }
}
