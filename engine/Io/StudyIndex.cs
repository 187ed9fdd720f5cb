using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Engine.Io;

/// <summary>
/// The slice headers found under a folder, a .zip archive or a single DICOM file, read header-only
/// (pixel data is read later, per slice, on demand). Files are visited in ordinal path order and results
/// keep that order whatever the thread count. Files that are not DICOM images are skipped with a note.
/// </summary>
public sealed class StudyIndex
{
    private StudyIndex(string root, IReadOnlyList<SliceHeader> slices, IReadOnlyList<StudyIndexNote> notes, int filesSeen)
    {
        RootPath = root;
        Slices = slices;
        Notes = notes;
        FilesSeen = filesSeen;
    }

    /// <summary>The inspected folder, archive or file (full path).</summary>
    public string RootPath { get; }

    /// <summary>One header per image frame, in file order.</summary>
    public IReadOnlyList<SliceHeader> Slices { get; }

    /// <summary>Files skipped, with reasons.</summary>
    public IReadOnlyList<StudyIndexNote> Notes { get; }

    /// <summary>Files and zip entries looked at.</summary>
    public int FilesSeen { get; }

    /// <summary>Assembles the slices into studies, series and stacks.</summary>
    public IReadOnlyList<AssembledStudy> Assemble(IReadOnlyDictionary<string, SeriesRole>? roleOverrides = null,
        StackTolerances? tolerances = null) =>
        SeriesAssembler.Assemble(Slices, new SeriesAssemblyOptions(roleOverrides, tolerances, RootPath));

    /// <summary>
    /// Indexes <paramref name="path"/>: a folder (recursively, .zip files inside included), a .zip archive or
    /// one DICOM file. Throws <see cref="InputFormatException"/> when nothing readable is found.
    /// </summary>
    public static StudyIndex Build(string path, ISliceHeaderReader reader, StudyIndexOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(reader);
        options ??= StudyIndexOptions.Default;
        var full = Path.GetFullPath(path);
        List<string> files;
        if (Directory.Exists(full)) files = ListFolder(full, options);
        else if (File.Exists(full)) files = [full];
        else throw new InputFormatException("no such file or folder", path, "give a folder, a .zip archive or a DICOM file");

        var perFile = new FileResult[files.Count];
        int done = 0;
        try
        {
            ParallelRange.For(files.Count, 8, (_, start, end) =>
            {
                for (int i = start; i < end; i++)
                {
                    perFile[i] = ReadOne(files[i], reader, options);
                    int d = Interlocked.Increment(ref done);
                    if (options.Progress is { } p && (d % 64 == 0 || d == files.Count)) p.Report((d, files.Count));
                }
            }, options.MaxDegreeOfParallelism);
        }
        catch (AggregateException ae) when (ae.Flatten().InnerExceptions.OfType<InputException>().FirstOrDefault() is { } first)
        {
            // Report the input problem itself (e.g. a zip bomb), not the thread machinery around it.
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Capture(first).Throw();
        }

        var slices = new List<SliceHeader>();
        var notes = new List<StudyIndexNote>();
        int seen = 0;
        foreach (var r in perFile)
        {
            slices.AddRange(r.Slices);
            notes.AddRange(r.Notes);
            seen += r.Seen;
        }
        if (seen > options.MaxFiles)
            throw new InputLimitException($"{seen:N0} files and zip entries exceed the limit of {options.MaxFiles:N0}", path,
                "index a smaller folder (one patient or one study)");
        if (slices.Count == 0) throw NothingFound(path, seen, notes);
        return new StudyIndex(full, slices, notes, seen);
    }

    private static InputFormatException NothingFound(string path, int seen, List<StudyIndexNote> notes)
    {
        if (seen == 0)
            return new InputFormatException("the folder holds no files", path, "point to a folder, .zip or file holding DICOM images");
        var reasons = notes.GroupBy(n => n.Reason).OrderByDescending(g => g.Count()).Take(3)
            .Select(g => $"{g.Count()} × {g.Key}");
        return new InputFormatException($"no DICOM images found among {seen} file(s): {string.Join("; ", reasons)}", path,
            "point to a folder, .zip or file holding DICOM images");
    }

    private static List<string> ListFolder(string folder, StudyIndexOptions options)
    {
        var enumeration = new EnumerationOptions
        {
            RecurseSubdirectories = true,
            IgnoreInaccessible = true,
            AttributesToSkip = FileAttributes.ReparsePoint,
            ReturnSpecialDirectories = false,
        };
        var files = new List<string>();
        foreach (var f in Directory.EnumerateFiles(folder, "*", enumeration))
        {
            files.Add(f);
            if (files.Count > options.MaxFiles)
                throw new InputLimitException($"more than {options.MaxFiles:N0} files under the folder", folder,
                    "index a smaller folder (one patient or one study)");
        }
        files.Sort(StringComparer.Ordinal);
        return files;
    }

    private sealed record FileResult(IReadOnlyList<SliceHeader> Slices, IReadOnlyList<StudyIndexNote> Notes, int Seen);

    private static FileResult ReadOne(string file, ISliceHeaderReader reader, StudyIndexOptions options)
    {
        if (file.EndsWith(".zip", StringComparison.OrdinalIgnoreCase)) return ReadZip(file, reader, options);
        try
        {
            if (!DicomSniffer.FileLooksLikeDicom(file)) return Skipped(file, "not DICOM (no DICM marker or data set start)");
            var r = reader.ReadFile(file);
            return r.SkipReason is null ? new FileResult(r.Slices, [], 1) : Skipped(file, r.SkipReason);
        }
        catch (InputException e)
        {
            return Skipped(file, "unreadable: " + e.Message);
        }
        catch (IOException e)
        {
            return Skipped(file, "unreadable: " + e.Message);
        }
    }

    private static FileResult Skipped(string where, string reason) => new([], [new StudyIndexNote(where, reason)], 1);

    /// <summary>Reads an archive's entries in name order; limit violations throw (the whole archive is refused).</summary>
    private static FileResult ReadZip(string file, ISliceHeaderReader reader, StudyIndexOptions options)
    {
        using var zip = new ZipReader(file, options.Zip ?? ZipLimits.Default);
        var slices = new List<SliceHeader>();
        var notes = new List<StudyIndexNote>();
        foreach (var e in zip.Entries)
        {
            var where = $"{file}!{e.FullName}";
            if (e.FullName.EndsWith(".zip", StringComparison.OrdinalIgnoreCase))
            {
                notes.Add(new StudyIndexNote(where, "nested archive not read (unpack it first)"));
                continue;
            }
            if (!DicomSniffer.LooksLikeDicom(zip.ReadHead(e, DicomSniffer.BytesNeeded)))
            {
                notes.Add(new StudyIndexNote(where, "not DICOM (no DICM marker or data set start)"));
                continue;
            }
            try
            {
                var r = reader.ReadBytes(zip.ReadEntry(e), new SliceSource(file, e.FullName));
                if (r.SkipReason is null) slices.AddRange(r.Slices);
                else notes.Add(new StudyIndexNote(where, r.SkipReason));
            }
            catch (InputFormatException ex)
            {
                notes.Add(new StudyIndexNote(where, "unreadable: " + ex.Message));
            }
        }
        return new FileResult(slices, notes, Math.Max(1, zip.Entries.Count));
    }
}
