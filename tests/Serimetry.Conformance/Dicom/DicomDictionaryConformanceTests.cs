using System.Text.RegularExpressions;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Dicom;

/// <summary>
/// The generated dictionary is what the generator makes from dcmtk's data dictionary, and Implicit VR
/// reading assigns the VRs dcmtk assigns. Src: dcmtk 3.6.7 (`/usr/share/libdcmtk17/dicom.dic`, `dcmdump`).
/// </summary>
public sealed partial class DicomDictionaryConformanceTests
{
    [Fact]
    public void Committed_dictionary_equals_the_generator_output_from_dcmtk()
    {
        const string source = "/usr/share/libdcmtk17/dicom.dic";
        Assert.True(File.Exists(source), $"{source} missing: scripts/test.sh installs dcmtk");
        using var tmp = new ReferenceTool.TempDir();
        var repo = SharedReference.RepoRoot;
        ReferenceTool.Run("python3", Path.Combine(repo, "tools", "gen-dicom-dictionary.py"), "--out", tmp.Path, source);
        foreach (var name in new[] { "DicomDictionary.Generated.cs", "DicomTags.Generated.cs" })
            Assert.Equal(File.ReadAllText(Path.Combine(repo, "engine", "Io", "Dicom", name)), File.ReadAllText(tmp.File(name)));
    }

    [Theory]
    [InlineData("MR_small_implicit.dcm")]
    [InlineData("MR_small_dataset_only_implicit_dcmtk.dcm")]
    [InlineData("priv_SQ.dcm")]
    [InlineData("nested_priv_SQ.dcm")]
    [InlineData("no_meta_group_length.dcm")]
    public void Implicit_vr_elements_get_the_vr_dcmdump_shows(string name)
    {
        var path = SharedReference.PathOf("dicom", "files", name);
        var expected = new Dictionary<uint, string>();
        foreach (var line in ReferenceTool.Capture("dcmdump", "-q", path).Split('\n'))
        {
            var m = TopLevelElement().Match(line);
            if (m.Success && !m.Groups[1].Value.StartsWith("fffe", StringComparison.Ordinal)) expected.TryAdd(DicomTag.Parse(m.Groups[1].Value).Value, m.Groups[2].Value);
        }
        var file = DicomFile.Read(path);
        var ours = file.FileMeta.Elements.Concat(file.Dataset.Elements).ToList();
        Assert.Equal(expected.Count, ours.Count);
        foreach (var e in ours)
        {
            // dcmdump prints "??" for elements without a dictionary entry; we call those UN.
            var want = expected[e.Tag.Value] == "??" ? "UN" : expected[e.Tag.Value];
            Assert.True(want == e.VR.Code(), $"{e.Tag}: dcmdump {want}, ours {e.VR.Code()}");
        }
    }

    [GeneratedRegex(@"^\(([0-9a-f]{4},[0-9a-f]{4})\) (\w\w|\?\?) ")]
    private static partial Regex TopLevelElement();
}
