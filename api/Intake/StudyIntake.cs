using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using Serimetry.Api.Storage;
using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Api.Intake;

/// <summary>One file of a study: its relative name in the study (forward slashes) and where its bytes are on disk.</summary>
public sealed record IntakeFile(string Name, string Path);

/// <summary>
/// Turns uploaded files into a stored study: files go to the blob store, the study folder the engine reads is
/// materialised under <c>studies/&lt;id&gt;</c> (temp folder, then one rename), and the study is indexed — with
/// <see cref="StudyIndex"/>/<see cref="InspectReport"/> for DICOM, with <see cref="ExamManifest"/> for a NIfTI exam.
/// The study id is a hash of the sorted (name, sha256) list, so re-sending the same files gives the same id. Files are
/// read from disk as streams, one at a time: a study of any size needs no more memory than a copy buffer.
/// </summary>
public sealed class StudyIntake(DataPaths paths, BlobStore blobs, MetadataStore store)
{
    /// <summary>
    /// Stores the files and returns the study row (the existing one when the same files came before). With
    /// <paramref name="moveFiles"/> the files (scratch copies on the data folder's volume) are moved into the blob store.
    /// </summary>
    public StudyRecord Ingest(IReadOnlyList<IntakeFile> files, bool moveFiles)
    {
        if (files.Count == 0) throw new InputFormatException("the upload holds no files", "request body", "send a zip of DICOM files or of a NIfTI exam with exam.json");
        var hashed = files.Select(f => (f.Name, Hash: blobs.Put(f.Path, moveFiles))).OrderBy(f => f.Name, StringComparer.Ordinal).ToList();
        string id = StudyId(hashed);
        if (store.FindStudy(id) is { } existing) return existing;
        var (dir, created) = Materialise(id, hashed);
        try { return store.AddStudy(Index(id, dir)); }
        catch (InputException) when (created)
        {
            // Unusable upload: the folder made for it goes (the blobs stay: content-addressed, shared, harmless).
            DeleteQuietly(dir);
            throw;
        }
    }

    private static string StudyId(IEnumerable<(string Name, string Hash)> files)
    {
        var sb = new StringBuilder();
        foreach (var (n, h) in files) sb.Append(n).Append('\0').Append(h).Append('\n');
        return Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(sb.ToString())))[..32];
    }

    /// <summary>The study folder at <c>studies/&lt;id&gt;</c>, built in scratch space and renamed into place; true when this call made it.</summary>
    private (string Dir, bool Created) Materialise(string id, IReadOnlyList<(string Name, string Hash)> files)
    {
        string final = Path.Combine(paths.Studies, id);
        if (Directory.Exists(final)) return (final, false);
        string tmp = Path.Combine(paths.Incoming, "study-" + Guid.NewGuid().ToString("N"));
        try
        {
            foreach (var (name, hash) in files)
            {
                string target = Path.GetFullPath(Path.Combine(tmp, name));
                if (!target.StartsWith(tmp + Path.DirectorySeparatorChar, StringComparison.Ordinal))
                    throw new InputFormatException($"file name '{name}' points outside the study (path traversal)", "request body", "use relative names");
                Directory.CreateDirectory(Path.GetDirectoryName(target)!);
                File.Copy(blobs.PathOf(hash), target);
            }
            // rename(2) of a folder onto an existing non-empty one fails: another node materialised the same files first.
            Directory.Move(tmp, final);
            return (final, true);
        }
        catch (IOException) when (Directory.Exists(final)) { return (final, false); }
        finally { DeleteQuietly(tmp); }
    }

    private static void DeleteQuietly(string dir)
    {
        try { if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true); }
        catch (IOException) { } // in use elsewhere: ScratchCleanup removes it later
    }

    /// <summary>DICOM DA (YYYYMMDD, PS3.5 §6.2) as ISO 8601 yyyy-MM-dd, like NIfTI exam dates; other text unchanged.</summary>
    private static string? IsoDate(string? da) =>
        da is { Length: 8 } && da.All(char.IsAsciiDigit) ? $"{da[..4]}-{da[4..6]}-{da[6..]}" : da;

    private static StudyRecord Index(string id, string dir)
    {
        string manifest = Path.Combine(dir, ExamManifest.FileName);
        if (File.Exists(manifest))
        {
            var m = ExamManifest.Load(manifest);
            var series = new List<object>();
            if (m.Series.T2w is not null) series.Add(new { role = "t2w", file = m.Series.T2w });
            if (m.Series.Adc is not null) series.Add(new { role = "adc", file = m.Series.Adc });
            foreach (var (b, f) in m.Series.Dwi ?? []) series.Add(new { role = "dwi", bValue = b, file = f });
            return new StudyRecord(id, m.PatientId, m.Date, "nifti", JsonSerializer.Serialize(series));
        }
        var report = InspectReport.From(StudyIndex.Build(dir, DicomSliceHeaderReader.Default));
        if (report.Studies.Count != 1)
            throw new InputFormatException($"the upload holds {report.Studies.Count} DICOM studies, expected exactly one", "request body",
                "send one study per request (or a NIfTI exam with exam.json)");
        var s = report.Studies[0];
        return new StudyRecord(id, s.PatientId, IsoDate(s.StudyDate), "dicom", JsonSerializer.Serialize(s.Series, InspectReport.JsonOptions));
    }
}
