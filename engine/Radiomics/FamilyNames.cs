namespace Serimetry.Engine.Radiomics;

/// <summary>Family names used in <see cref="FeatureValue.Family"/> and the CSV output.</summary>
public static class FamilyNames
{
    public const string Morphology = "morphology";
    public const string LocalIntensity = "local_intensity";
    public const string IntensityStatistics = "intensity_statistics";
    public const string IntensityHistogram = "intensity_histogram";
    public const string IntensityVolumeHistogram = "intensity_volume_histogram";
    public const string Glcm = "glcm";
    public const string Glrlm = "glrlm";
    public const string Glszm = "glszm";
    public const string Gldzm = "gldzm";
    public const string Ngtdm = "ngtdm";
    public const string Ngldm = "ngldm";
}
