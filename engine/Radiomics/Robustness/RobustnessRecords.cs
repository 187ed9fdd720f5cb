namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>
/// One feature value of one subject in one repeat of a test-retest study (repeat = 0, 1, …), optionally tied to a
/// region (e.g. "lesion", "gland") and an image (e.g. "t2w", "adc"); empty region and image apply to any.
/// </summary>
public sealed record TestRetestValue(string SubjectId, int Repeat, FeatureValue Feature, string Region = "", string Image = "");

/// <summary>
/// Test-retest reliability of one feature (in one region and image when the table names them): ICC(2,1) (two-way
/// random effects, absolute agreement, single measurement; Shrout &amp; Fleiss 1979, McGraw &amp; Wong 1996) over
/// <paramref name="Subjects"/> complete subjects and <paramref name="Repeats"/> repeats. NaN when fewer than two
/// subjects or repeats, or no variance.
/// </summary>
public sealed record FeatureReliability(string Family, string Feature, string IbsiCode, string AggregationCode,
    double Icc, int Subjects, int Repeats, bool Robust, string Region = "", string Image = "");

/// <summary>The features of one exam and its acquisition parameters (e.g. "RepetitionTimeMs", "SliceThicknessMm").</summary>
public sealed record ExamFeatures(string ExamId, IReadOnlyDictionary<string, double> AcquisitionParameters,
    IReadOnlyList<FeatureValue> Features);

/// <summary>
/// Spearman rank correlation of one feature with one acquisition parameter across exams;
/// <paramref name="Strong"/> when |ρ| reaches the threshold. NaN when either side is constant or fewer than 3 exams.
/// </summary>
public sealed record AcquisitionCorrelation(string Family, string Feature, string IbsiCode, string AggregationCode,
    string Parameter, double SpearmanRho, int Exams, bool Strong);
