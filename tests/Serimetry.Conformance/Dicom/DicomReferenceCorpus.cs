using Xunit;
using Serimetry.Tests.Shared;

namespace Serimetry.Conformance.Dicom;

/// <summary>The DICOM reference corpus (shared/reference/dicom) and its manifest/header tables.</summary>
internal static class DicomReferenceCorpus
{
    private static readonly Lazy<IReadOnlyList<(string Path, IReadOnlyDictionary<string, string> Row)>> ManifestRows = new(() =>
        [
            .. ReferenceCsv.Read(SharedReference.PathOf("dicom", "manifest.csv"))
                .Select(r => (SharedReference.PathOf("dicom", "files", r["file"]), r)),
            .. ReferenceCsv.Read(SharedReference.PathOf("dicom", "series-oblique", "manifest.csv"))
                .Select(r => (SharedReference.PathOf("dicom", "series-oblique", r["file"]), r)),
        ]);

    private static readonly Lazy<IReadOnlyList<(string Path, IReadOnlyDictionary<string, string> Row)>> HeaderRows = new(() =>
        [
            .. ReferenceCsv.Read(SharedReference.PathOf("dicom", "headers.csv"))
                .Select(r => (SharedReference.PathOf("dicom", "files", r["file"]), r)),
            .. ReferenceCsv.Read(SharedReference.PathOf("dicom", "series-oblique", "headers.csv"))
                .Select(r => (SharedReference.PathOf("dicom", "series-oblique", r["file"]), r)),
        ]);

    public static IReadOnlyList<(string Path, IReadOnlyDictionary<string, string> Row)> Manifest => ManifestRows.Value;

    public static IReadOnlyList<(string Path, IReadOnlyDictionary<string, string> Row)> Headers => HeaderRows.Value;

    /// <summary>xunit member data: the display name of every manifest row.</summary>
    public static TheoryData<string> ManifestNames()
    {
        var d = new TheoryData<string>();
        foreach (var (p, _) in Manifest) d.Add(Display(p));
        return d;
    }

    public static TheoryData<string> HeaderNames()
    {
        var d = new TheoryData<string>();
        foreach (var (p, _) in Headers) d.Add(Display(p));
        return d;
    }

    public static (string Path, IReadOnlyDictionary<string, string> Row) ManifestOf(string name) =>
        Manifest.Single(m => Display(m.Path) == name);

    public static (string Path, IReadOnlyDictionary<string, string> Row) HeadersOf(string name) =>
        Headers.Single(m => Display(m.Path) == name);

    private static string Display(string path) =>
        Path.GetFileName(Path.GetDirectoryName(path)) == "series-oblique" ? "series-oblique/" + Path.GetFileName(path) : Path.GetFileName(path);
}
