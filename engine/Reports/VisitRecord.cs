namespace Serimetry.Engine.Reports;

/// <summary>One visit in change.json.</summary>
/// <param name="Index">0 = baseline.</param>
/// <param name="Date">Exam date, YYYY-MM-DD.</param>
/// <param name="StudyInstanceUid">DICOM Study Instance UID (0020,000D), or null for NIfTI exams.</param>
/// <param name="Registration">Alignment of this visit to the baseline (identity for the baseline).</param>
/// <param name="Values">Measure id → value.</param>
/// <param name="LesionRefit">Agreement of the re-fitted lesion outline with the propagated one, or null.</param>
/// <param name="Flags">Notes about this visit (missing series, failed steps).</param>
public sealed record VisitRecord(
    int Index,
    string Date,
    string? StudyInstanceUid,
    RegistrationRecord Registration,
    IReadOnlyDictionary<string, ValueRecord> Values,
    LesionRefitRecord? LesionRefit,
    IReadOnlyList<string> Flags);

/// <summary>How a follow-up was aligned to the baseline.</summary>
/// <param name="Transform">The transform mapping baseline (fixed) points to this visit's (moving) points.</param>
/// <param name="MetricBefore">Registration similarity metric before alignment, as the registration reports it, or null.</param>
/// <param name="MetricAfter">The same metric after alignment, or null.</param>
/// <param name="GlandDice">Dice of the propagated gland with this visit's own gland mask, when one was given.</param>
/// <param name="Flags">Stop reasons and warnings of the alignment.</param>
public sealed record RegistrationRecord(TransformRecord Transform, double? MetricBefore, double? MetricAfter, double? GlandDice,
    IReadOnlyList<string> Flags)
{
    /// <summary>
    /// With a deformable alignment and a baseline lesion: the lesion volume ratio the deformation's free-form part
    /// alone imposes (1.0 = it absorbed none of the lesion's change); null otherwise.
    /// </summary>
    public double? AbsorbedChange { get; init; }

    /// <summary>The baseline's own record: identity, no metrics.</summary>
    public static RegistrationRecord Identity { get; } = new(TransformRecord.Identity, null, null, null, []);
}

/// <summary>A transform as data: its kind, a 4x4 row-major matrix (LPS mm, fixed → moving) for linear
/// kinds, and the name of a file holding the rest (e.g. B-spline coefficients) when there is one.</summary>
public sealed record TransformRecord(string Kind, double[]? Matrix4x4, string? File = null)
{
    /// <summary>The identity transform.</summary>
    public static TransformRecord Identity { get; } = new("identity", [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);

    /// <summary>A linear transform as a record of the given kind (e.g. <c>rigid</c>, <c>affine</c>).</summary>
    public static TransformRecord FromAffine(Core.AffineTransform transform, string kind = "rigid", string? file = null) =>
        new(kind, transform.ToMatrix4x4(), file);

    /// <summary>The linear part back as an <see cref="Core.AffineTransform"/>, or null when there is no matrix.</summary>
    public Core.AffineTransform? ToAffine() => Matrix4x4 is { Length: 16 } m ? Core.AffineTransform.FromMatrix4x4(m) : null;
}

/// <summary>One measured value in change.json; value null unless status is ok.</summary>
public sealed record ValueRecord(double? Value, string Unit, string Status, string? Reason = null);

/// <summary>Agreement of the re-fitted lesion outline with the propagated one.</summary>
public sealed record LesionRefitRecord(double? Dice, double? CentroidShiftMm, IReadOnlyList<string> Flags);
