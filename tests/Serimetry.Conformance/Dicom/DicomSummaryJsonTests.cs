using System.Globalization;
using System.Text.Json;
using Serimetry.Engine.Io.Dicom;
using Xunit;

namespace Serimetry.Conformance.Dicom;

/// <summary>
/// The JSON that `inspect FILE.dcm --json` prints has the shape checks rely on, with the manifest's
/// figures. Src: dcmtk/GDCM decodes in shared/reference/dicom/manifest.csv.
/// </summary>
public sealed class DicomSummaryJsonTests
{
    [Theory]
    [InlineData("MR_small_bigendian.dcm")]
    [InlineData("emri_small.dcm")]
    [InlineData("liver_nonbyte_aligned.dcm")]
    [InlineData("series-oblique/IM0005.dcm")]
    public void Summary_json_carries_transfer_syntax_size_and_per_frame_stats(string name)
    {
        var (path, row) = DicomReferenceCorpus.ManifestOf(name);
        using var doc = JsonDocument.Parse(DicomFileSummary.FromFile(path).ToJson());
        var root = doc.RootElement;
        Assert.Equal(row["transfer_syntax_uid"], root.GetProperty("transferSyntaxUid").GetString());
        Assert.Equal(int.Parse(row["rows"], CultureInfo.InvariantCulture), root.GetProperty("rows").GetInt32());
        Assert.Equal(int.Parse(row["columns"], CultureInfo.InvariantCulture), root.GetProperty("columns").GetInt32());
        var frames = row["number_of_frames"].Length == 0 ? 1 : int.Parse(row["number_of_frames"], CultureInfo.InvariantCulture);
        Assert.Equal(frames, root.GetProperty("frames").GetInt32());
        var stats = root.GetProperty("pixelStats");
        Assert.Equal(frames, stats.GetArrayLength());
        var first = stats[0];
        Assert.Equal(long.Parse(row["frame1_min"], CultureInfo.InvariantCulture), first.GetProperty("min").GetInt64());
        Assert.Equal(long.Parse(row["frame1_max"], CultureInfo.InvariantCulture), first.GetProperty("max").GetInt64());
        Assert.Equal(row["frame1_mean"], DicomFileSummary.FormatMean(first.GetProperty("mean").GetDouble()));
        Assert.Equal(row["frame1_values_sha256"], first.GetProperty("sha256").GetString());
    }
}
