using System.Globalization;
using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry inspect PATH [--json]</c>: studies and series under a folder, .zip, DICOM or NIfTI file.</summary>
internal sealed class InspectVerb : IVerb
{
    public VerbSpec Spec { get; } = new(
        "inspect",
        "List studies and series (role, size, spacing, origin, direction, b-values, acquisition)",
        "PATH [--json] [--role SERIES_UID=ROLE ...]",
        [
            new OptionSpec("json", null, "print JSON (for one DICOM file: transfer syntax, size and per-frame pixel statistics)"),
            new OptionSpec("role", "UID=ROLE", "assign a role (t2w, adc, dwi, other) to a series by its Series Instance UID", Repeatable: true),
            new OptionSpec("threads", "N", "threads for reading headers (default: all cores)"),
        ],
        MinPositionals: 1, MaxPositionals: 1,
        Details: "PATH is a folder (searched recursively, .zip files inside included), a .zip archive, one DICOM file,\n" +
                 "or a NIfTI file (.nii, .nii.gz). Only headers are read. Slices are ordered along the slice normal,\n" +
                 "slice spacing comes from positions, and gaps, uneven spacing, duplicate positions and mixed\n" +
                 "orientations are listed as warnings. Roles follow docs/series.md; --role overrides them.");

    public int Run(ParsedArgs args, CliContext ctx)
    {
        var path = args.Positionals[0];
        var overrides = ParseRoles(args.GetAll("role"));
        bool json = args.Has("json");
        if (IsNifti(path))
        {
            var nifti = NiftiInspector.Summarize(path, SingleOverride(overrides));
            Print(InspectReport.FromSummaries([nifti]), json, ctx);
            return CliHost.ExitOk;
        }
        if (json && File.Exists(path) && !path.EndsWith(".zip", StringComparison.OrdinalIgnoreCase))
        {
            ctx.Out.WriteLine(DicomFileSummary.FromFile(path).ToJson());
            return CliHost.ExitOk;
        }
        var options = new StudyIndexOptions(MaxDegreeOfParallelism: args.GetInt("threads", -1, -1, 256),
            Progress: ShowsProgress(ctx) ? new TerminalProgress(ctx.Err) : null);
        var index = StudyIndex.Build(path, DicomSliceHeaderReader.Default, options);
        var report = InspectReport.From(index, overrides);
        var known = report.Studies.SelectMany(s => s.Series).Select(s => s.SeriesInstanceUid).ToHashSet(StringComparer.Ordinal);
        foreach (var uid in overrides.Keys.Where(k => !known.Contains(k)))
            throw new InvalidParameterException($"--role names series {uid}, which is not under PATH", "--role",
                "copy the seriesInstanceUid from 'serimetry inspect PATH --json'");
        Print(report, json, ctx);
        return CliHost.ExitOk;
    }

    /// <summary>Progress goes to stderr only when it is a terminal (never into redirected output or logs).</summary>
    private static bool ShowsProgress(CliContext ctx) => ReferenceEquals(ctx.Err, Console.Error) && !Console.IsErrorRedirected;

    private sealed class TerminalProgress(TextWriter err) : IProgress<(int Done, int Total)>
    {
        private readonly Lock _lock = new();

        public void Report((int Done, int Total) value)
        {
            lock (_lock)
            {
                err.Write($"\rreading headers: {value.Done}/{value.Total} files");
                if (value.Done == value.Total) err.Write("\r" + new string(' ', 48) + "\r");
            }
        }
    }

    private static bool IsNifti(string path) =>
        path.EndsWith(".nii", StringComparison.OrdinalIgnoreCase) || path.EndsWith(".nii.gz", StringComparison.OrdinalIgnoreCase);

    private static SeriesRole? SingleOverride(Dictionary<string, SeriesRole> overrides) =>
        overrides.Count > 0 ? overrides.Values.First() : null;

    internal static Dictionary<string, SeriesRole> ParseRoles(IReadOnlyList<string> values)
    {
        var map = new Dictionary<string, SeriesRole>(StringComparer.Ordinal);
        foreach (var v in values)
        {
            int eq = v.LastIndexOf('=');
            var role = eq > 0 ? InspectReport.ParseRole(v[(eq + 1)..]) : null;
            if (role is null)
                throw new UsageException($"option '--role' needs SERIES_UID=ROLE with ROLE one of t2w, adc, dwi, other; got '{v}'");
            map[v[..eq].Trim()] = role.Value;
        }
        return map;
    }

    private static void Print(InspectReport report, bool json, CliContext ctx)
    {
        if (json)
        {
            ctx.Out.WriteLine(report.ToJson());
            return;
        }
        foreach (var study in report.Studies) PrintStudy(study, ctx.Out);
        if (report.Skipped.Count > 0)
        {
            ctx.Out.WriteLine($"Skipped {report.Skipped.Count} file(s) that hold no DICOM image:");
            foreach (var s in report.Skipped.Take(10)) ctx.Out.WriteLine($"  {s.File}: {s.Reason}");
            if (report.Skipped.Count > 10) ctx.Out.WriteLine($"  … and {report.Skipped.Count - 10} more (see --json)");
        }
        ctx.Out.WriteLine();
        ctx.Out.WriteLine(SoftwareInfo.Caution);
    }

    /// <summary>A readable table; the patient ID is left out (it is in --json output only).</summary>
    private static void PrintStudy(InspectStudy study, TextWriter w)
    {
        w.WriteLine($"Study {study.StudyInstanceUid ?? "(no UID)"}  date {FormatDate(study.StudyDate)}  {study.Series.Count} series");
        foreach (var x in study.Warnings) w.WriteLine($"  ! {x}");
        w.WriteLine($"  {"#",4}  {"role",-5}  {"size",-12}  {"spacing mm",-20}  {"b-values",-16}  {"files",5}  description");
        foreach (var s in study.Series)
        {
            var b = s.BValues.Count == 0 ? "-" : string.Join(",", s.BValues.Select(v => v.ToString("G6", CultureInfo.InvariantCulture)));
            w.WriteLine($"  {s.SeriesNumber?.ToString(CultureInfo.InvariantCulture) ?? "-",4}  {s.Role,-5}  {string.Join("x", s.Size),-12}  " +
                        $"{Spacing(s.Spacing),-20}  {b,-16}  {s.NumberOfFiles,5}  {s.SeriesDescription ?? ""}");
            foreach (var x in s.Warnings) w.WriteLine($"        ! {x}");
        }
        w.WriteLine();
    }

    private static string Spacing(double?[] v) =>
        string.Join(" x ", v.Select(x => x is { } d ? d.ToString("0.###", CultureInfo.InvariantCulture) : "?"));

    private static string FormatDate(string? da) =>
        da is { Length: 8 } ? $"{da[..4]}-{da[4..6]}-{da[6..]}" : da ?? "(none)";
}
