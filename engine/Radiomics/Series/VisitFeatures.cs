namespace Serimetry.Engine.Radiomics.Series;

/// <summary>The features of one region (e.g. "lesion", "gland") in one image (e.g. "t2w", "adc") at one visit.</summary>
public sealed record VisitFeatures(string VisitId, DateOnly? Date, string Region, IReadOnlyList<FeatureValue> Features, string Image = "");

/// <summary>
/// Change of one feature between a baseline and a follow-up visit of the same region and image; <c>RelativeDelta</c>
/// is Delta / |Baseline|, NaN when the baseline is 0 or not finite.
/// </summary>
public sealed record FeatureDelta(string Region, string Family, string Feature, string IbsiCode, string AggregationCode,
    double Baseline, double FollowUp, double Delta, double RelativeDelta, string Image = "");
