using Serimetry.Engine.Io.Dicom;
using Xunit;

namespace Serimetry.Conformance.Dicom;

/// <summary>
/// Header values against headers.csv. Src: dcmtk 3.6.7 `dcmdump` of shared/reference/dicom, with
/// functional-group values taken as its README describes (top level, else first standard macro item
/// of Shared, else Per-frame frame 1).
/// </summary>
public sealed class DicomHeaderConformanceTests
{
    private static readonly string[] Columns =
        ["PatientID", "SeriesInstanceUID", "ImagePositionPatient", "ImageOrientationPatient", "PixelSpacing", "SliceThickness"];

    public static TheoryData<string> Files() => DicomReferenceCorpus.HeaderNames();

    [Theory]
    [MemberData(nameof(Files))]
    public void Header_values_and_functional_group_paths_equal_dcmdump(string name)
    {
        var (path, row) = DicomReferenceCorpus.HeadersOf(name);
        var ds = DicomFile.ReadHeader(path).Dataset;
        var expectedPaths = ParsePaths(row.TryGetValue("nested_paths", out var p) ? p : "");
        foreach (var column in Columns)
        {
            Assert.True(DicomDictionary.TryFindKeyword(column, out var tag));
            var found = DicomFunctionalGroups.Find(ds, tag);
            var expected = row[column];
            if (expected.Length == 0)
            {
                Assert.Null(found);
                continue;
            }
            Assert.NotNull(found);
            var ours = found.Holder.GetString(tag);
            Assert.Equal(expected == "<empty>" ? "" : expected, ours);
            Assert.Equal(expectedPaths.GetValueOrDefault(column), found.Path);
        }
    }

    private static Dictionary<string, string> ParsePaths(string text)
    {
        var d = new Dictionary<string, string>();
        foreach (var part in text.Split(';', StringSplitOptions.RemoveEmptyEntries))
        {
            var kv = part.Split('=', 2);
            d[kv[0]] = kv[1].ToUpperInvariant();
        }
        return d;
    }
}
