using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics.Intensity;
using Serimetry.Engine.Radiomics.Morphology;
using Serimetry.Engine.Radiomics.Preparation;
using Serimetry.Engine.Radiomics.Texture;

namespace Serimetry.Engine.Radiomics;

/// <summary>
/// Computes IBSI chapter 1 radiomic features (Zwanenburg et al., IBSI reference manual arXiv:1612.07003;
/// Radiology 2020, doi:10.1148/radiol.2020191145) of an image inside a mask on the same grid.
/// </summary>
public static class RadiomicsExtractor
{
    /// <summary>
    /// Runs the processing chain of <paramref name="settings"/> and every selected family. Throws
    /// <see cref="GeometryMismatchException"/> when the grids differ, <see cref="InputFormatException"/> for an
    /// empty ROI or (by default) non-finite ROI intensities, <see cref="InvalidParameterException"/> for bad settings.
    /// Features undefined for the ROI are NaN (docs/radiomics.md, "NaN policy").
    /// </summary>
    public static IReadOnlyList<FeatureValue> Extract(Volume<float> image, Volume<byte> mask, RadiomicsSettings settings)
    {
        var roi = RoiPreparer.Prepare(image, mask, settings);
        var sink = new FeatureSink();
        var families = settings.Families;
        if (families.Contains(FeatureFamily.Morphology)) MorphologyFeatures.Compute(roi, settings, sink);
        if (families.Contains(FeatureFamily.LocalIntensity)) LocalIntensity.Compute(roi, sink);
        if (families.Contains(FeatureFamily.IntensityStatistics)) IntensityFamilies.Statistics(roi, sink);
        if (families.Contains(FeatureFamily.IntensityHistogram)) IntensityFamilies.Histogram(roi, sink);
        if (families.Contains(FeatureFamily.IntensityVolumeHistogram)) IntensityVolumeHistogram.Compute(roi, sink);
        TextureFamilies.Run(roi, settings, sink);
        return sink.Values;
    }
}
