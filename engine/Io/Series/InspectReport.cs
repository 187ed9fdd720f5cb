using System.Text.Encodings.Web;
using System.Text.Json;
using System.Text.Json.Serialization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// What <c>serimetry inspect</c> reports for a folder, archive or NIfTI file, in the JSON shape other
/// tools rely on: <c>{"studies":[{"studyInstanceUid","patientId","studyDate","series":[…]}]}</c>.
/// Extra fields are additions; the named ones keep their meaning.
/// </summary>
public sealed record InspectReport(
    IReadOnlyList<InspectStudy> Studies,
    IReadOnlyList<InspectSkipped> Skipped,
    int FilesSeen,
    string Caution)
{
    /// <summary>JSON options: camelCase names, nulls omitted, indented.</summary>
    public static readonly JsonSerializerOptions JsonOptions = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
        WriteIndented = true,
        Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
    };

    public string ToJson() => JsonSerializer.Serialize(this, JsonOptions);

    /// <summary>Builds the report from an index.</summary>
    public static InspectReport From(StudyIndex index, IReadOnlyDictionary<string, SeriesRole>? roleOverrides = null)
    {
        ArgumentNullException.ThrowIfNull(index);
        var studies = index.Assemble(roleOverrides).Select(InspectStudy.From).ToList();
        var skipped = index.Notes.Select(n => new InspectSkipped(Relative(index.RootPath, n.Where), n.Reason)).ToList();
        return new InspectReport(studies, skipped, index.FilesSeen, SoftwareInfo.Caution);
    }

    /// <summary>Builds the report from summaries made by another reader (e.g. a NIfTI file).</summary>
    public static InspectReport FromSummaries(IReadOnlyList<StudySummary> studies) =>
        new(studies.Select(st => new InspectStudy(st.StudyInstanceUid, st.PatientId, st.StudyDate,
            st.Series.Select(InspectSeries.FromSummary).ToList(), [])).ToList(), [], studies.Count, SoftwareInfo.Caution);

    private static string Relative(string root, string where) =>
        Directory.Exists(root) && where.StartsWith(root, StringComparison.Ordinal) ? Path.GetRelativePath(root, where) : where;

    /// <summary>The role as the JSON contract spells it: t2w, adc, dwi or other.</summary>
    public static string RoleName(SeriesRole role) => role switch
    {
        SeriesRole.T2w => "t2w",
        SeriesRole.Adc => "adc",
        SeriesRole.Dwi => "dwi",
        _ => "other",
    };

    /// <summary>Parses a role name (t2w, adc, dwi, other; case-insensitive); null when unknown.</summary>
    public static SeriesRole? ParseRole(string text) => text.Trim().ToLowerInvariant() switch
    {
        "t2w" or "t2" => SeriesRole.T2w,
        "adc" => SeriesRole.Adc,
        "dwi" => SeriesRole.Dwi,
        "other" => SeriesRole.Other,
        _ => null,
    };
}

/// <summary>A file that gave no images.</summary>
public sealed record InspectSkipped(string File, string Reason);

/// <summary>One study of the report.</summary>
public sealed record InspectStudy(
    string? StudyInstanceUid,
    string? PatientId,
    string? StudyDate,
    IReadOnlyList<InspectSeries> Series,
    IReadOnlyList<string> Warnings)
{
    public static InspectStudy From(AssembledStudy s) =>
        new(s.StudyInstanceUid, s.PatientId, s.StudyDate, s.Series.Select(InspectSeries.From).ToList(), s.Warnings);
}

/// <summary>One series: the contract fields first, then additions.</summary>
public sealed record InspectSeries(
    string SeriesInstanceUid,
    string Role,
    int[] Size,
    double?[] Spacing,
    double?[] Origin,
    double?[] Direction,
    IReadOnlyList<double> BValues,
    int? SeriesNumber,
    string? SeriesDescription,
    string? Modality,
    string RoleReason,
    bool Computed,
    double? FieldStrength,
    string? Manufacturer,
    string? Model,
    double? Tr,
    double? Te,
    double? SliceThickness,
    int NumberOfFiles,
    string Source,
    IReadOnlyList<InspectStack> Stacks,
    IReadOnlyList<string> Warnings)
{
    public static InspectSeries From(AssembledSeries s)
    {
        var m = s.Summary;
        var a = m.Acquisition;
        return new InspectSeries(m.SeriesInstanceUid, InspectReport.RoleName(m.Role), m.Size.ToArray(), Finite(m.SpacingMm),
            Finite(m.OriginMm), DirectionOf(m), m.BValues, s.SeriesNumber, a.SeriesDescription, a.Modality,
            s.Role.Reason, s.Role.IsComputed, a.FieldStrengthT, a.Manufacturer, a.Model, a.RepetitionTimeMs, a.EchoTimeMs,
            a.SliceThicknessMm, s.NumberOfFiles, m.Source, s.Stacks.Select(InspectStack.From).ToList(), m.Warnings);
    }

    /// <summary>A series known only by its summary (no stacks, no files).</summary>
    public static InspectSeries FromSummary(SeriesSummary m)
    {
        var a = m.Acquisition;
        return new InspectSeries(m.SeriesInstanceUid, InspectReport.RoleName(m.Role), m.Size.ToArray(), Finite(m.SpacingMm),
            Finite(m.OriginMm), DirectionOf(m), m.BValues, null, a.SeriesDescription, a.Modality, "from the file's header",
            false, a.FieldStrengthT, a.Manufacturer, a.Model, a.RepetitionTimeMs, a.EchoTimeMs, a.SliceThicknessMm, 1, m.Source,
            [], m.Warnings);
    }

    internal static double?[] Finite(Vec3 v) => [F(v.X), F(v.Y), F(v.Z)];

    private static double? F(double x) => double.IsFinite(x) ? x + 0.0 : null;

    /// <summary>
    /// The direction, row-major, with negative zero written as 0 (cosines of exactly 0 come out of cross
    /// products as -0); nulls when the series has no geometry (its origin is unknown).
    /// </summary>
    private static double?[] DirectionOf(SeriesSummary m)
    {
        if (!m.OriginMm.IsFinite) return new double?[9];
        return m.Direction.ToRowMajor().Select(v => (double?)(v + 0.0)).ToArray();
    }
}

/// <summary>One stack of a series (orientation / b-value / grid).</summary>
public sealed record InspectStack(string Label, int[] Size, double? BValue, string? BValueSource, bool Regular, string? Problem)
{
    public static InspectStack From(SliceStack s)
    {
        var f = s.Slices[0];
        int[] size = s.Geometry?.Size.ToArray() ?? [f.Columns, f.Rows, s.Slices.Count];
        return new InspectStack(s.Label, size, s.BValue, s.BValue is null ? null : s.BValueSource, s.IsRegular, s.BlockingProblem);
    }
}
