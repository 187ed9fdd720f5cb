namespace Serimetry.Engine.Repeatability;

/// <summary>A point estimate with its two-sided 95 % confidence interval (bounds null when undefined).</summary>
public sealed record Estimate(double? Value, double? CiLow, double? CiHigh);

/// <summary>
/// Bland-Altman agreement of two repeats (Bland &amp; Altman, Lancet 1986; SMMR 1999;8:135):
/// differences d = second − first (repeat labels in order of first appearance in the table),
/// bias = mean d, limits of agreement = bias ± 1.96·SD(d). CIs: bias ± t(0.975, n−1)·SD/√n; each limit
/// ± t(0.975, n−1)·SD·√(3/n) (the approximate SE √(3s²/n) of the 1986 paper).
/// </summary>
public sealed record BlandAltmanResult(
    string FirstRepeat,
    string SecondRepeat,
    int NPairs,
    Estimate Bias,
    double SdDifferences,
    Estimate LoaLow,
    Estimate LoaHigh);

/// <summary>
/// Shrout &amp; Fleiss (1979) intraclass correlations with 95 % CIs (exact F for ICC(1,·) and ICC(3,·),
/// Satterthwaite approximation for ICC(2,·), McGraw &amp; Wong 1996).
/// </summary>
public sealed record IccSet(Estimate Icc11, Estimate Icc21, Estimate Icc31, Estimate Icc1k, Estimate Icc2k, Estimate Icc3k);

/// <summary>Test-retest statistics of one measure over subjects × repeats.</summary>
/// <param name="Measure">Measure id.</param>
/// <param name="NSubjects">Subjects with at least two non-missing repeats (used for wSD, wCV, RC, ICC(1,·)).</param>
/// <param name="NRepeats">Distinct repeat labels of this measure.</param>
/// <param name="NObservations">Non-missing values used.</param>
/// <param name="NCompleteSubjects">Subjects with every repeat label (used for ICC(2,·), ICC(3,·), Bland-Altman).</param>
/// <param name="Mean">Grand mean of the values used.</param>
/// <param name="WithinSubjectSd">wSD: root of the pooled within-subject variance Σ(x−x̄ᵢ)²/Σ(nᵢ−1).</param>
/// <param name="WithinSubjectSdCi">95 % CI of wSD from the χ² distribution of the pooled variance.</param>
/// <param name="WithinSubjectCv">Reported wCV: log method, √(exp(s²)−1) with s the wSD of ln values; null when a value ≤ 0.</param>
/// <param name="WithinSubjectCvRms">Alternative wCV: root mean square of the per-subject CVs (SDᵢ/meanᵢ).</param>
/// <param name="SdLog">s, the wSD of natural-log values (the σL the change engine uses on the log scale).</param>
/// <param name="Rc">RC = 1.96·√2·wSD ≈ 2.77·wSD.</param>
/// <param name="RcRelative">Relative RC = 1.96·√2·wCV (fraction); RC/mean when wCV is undefined.</param>
/// <param name="Icc">ICC forms; two-way forms null without at least two complete subjects.</param>
/// <param name="BlandAltman">Agreement of the two repeats, only when the measure has exactly two repeat labels.</param>
/// <param name="Notes">What was dropped or could not be estimated, and why.</param>
public sealed record MeasureRepeatability(
    string Measure,
    int NSubjects,
    int NRepeats,
    int NObservations,
    int NCompleteSubjects,
    double Mean,
    double WithinSubjectSd,
    Estimate WithinSubjectSdCi,
    double? WithinSubjectCv,
    double? WithinSubjectCvRms,
    double? SdLog,
    double Rc,
    double? RcRelative,
    IccSet Icc,
    BlandAltmanResult? BlandAltman,
    IReadOnlyList<string> Notes);

/// <summary>Test-retest statistics of every measure in a table.</summary>
public sealed record TestRetestReport(IReadOnlyList<MeasureRepeatability> Measures);
