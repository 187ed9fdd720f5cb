namespace Serimetry.Engine.Radiomics;

/// <summary>
/// One radiomic feature value. <paramref name="IbsiCode"/> is the 4-character IBSI feature identifier;
/// <paramref name="AggregationCode"/> the IBSI aggregation identifier of a texture feature (e.g. <c>IAZD</c> 3D merged),
/// empty for the whole-ROI families (morphology, local intensity, statistics, histograms), which IBSI computes
/// on the 3D volume only. NaN means "not defined for this ROI" (see docs/radiomics.md).
/// </summary>
public sealed record FeatureValue(string Family, string Feature, string IbsiCode, string AggregationCode, double Value);

/// <summary>IBSI aggregation identifiers (IBSI reference manual, section 3.1.1, table of aggregation methods).</summary>
public static class IbsiAggregation
{
    /// <summary>
    /// No aggregation: the non-texture families describe the whole 3D ROI. IBSI's reference tables label these
    /// rows <c>DHQ4</c> ("3D volume"); <see cref="VolumeReferenceCode"/> maps between the two.
    /// </summary>
    public const string None = "";
    /// <summary>The label IBSI's reference tables give the whole-volume (non-texture) rows.</summary>
    public const string VolumeReferenceCode = "DHQ4";
    /// <summary>GLCM/GLRLM: per slice and direction, averaged.</summary>
    public const string TwoDAveraged = "BTW3";
    /// <summary>GLCM/GLRLM: per slice, directions merged, averaged over slices.</summary>
    public const string TwoDSliceMerged = "SUJT";
    /// <summary>GLCM/GLRLM: per direction merged over slices, averaged over directions.</summary>
    public const string TwoPointFiveDDirectionMerged = "JJUI";
    /// <summary>GLCM/GLRLM: everything merged.</summary>
    public const string TwoPointFiveDMerged = "ZW7Z";
    /// <summary>GLCM/GLRLM: per 3D direction, averaged.</summary>
    public const string ThreeDAveraged = "ITBB";
    /// <summary>GLCM/GLRLM: 3D directions merged.</summary>
    public const string ThreeDMerged = "IAZD";
    /// <summary>GLSZM/GLDZM/NGTDM/NGLDM: per slice, averaged.</summary>
    public const string TwoD = "8QNN";
    /// <summary>GLSZM/GLDZM/NGTDM/NGLDM: slices merged.</summary>
    public const string TwoPointFiveD = "62GR";
    /// <summary>GLSZM/GLDZM/NGTDM/NGLDM: one 3D matrix.</summary>
    public const string ThreeD = "KOBO";
}
