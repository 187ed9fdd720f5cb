using System.Text.Json.Serialization;

namespace Serimetry.Engine.Radiomics;

/// <summary>
/// Every step of the IBSI chapter 1 processing chain as data (Zwanenburg et al., IBSI reference manual
/// arXiv:1612.07003, chapter 2 "Image processing"): resampling, re-segmentation, discretisation, and the
/// texture-matrix parameters. Serialises to/from JSON (camelCase; see docs/radiomics.md).
/// </summary>
public sealed record RadiomicsSettings
{
    /// <summary>Interpolation to new voxel spacing; null keeps the native grid (IBSI 2.4).</summary>
    public ResamplingSettings? Resampling { get; init; }

    /// <summary>Re-segmentation of the intensity mask (IBSI 2.5); null keeps the whole ROI.</summary>
    public ResegmentationSettings? Resegmentation { get; init; }

    /// <summary>Discretisation for the intensity histogram and texture families (IBSI 2.7).</summary>
    public DiscretisationSettings Discretisation { get; init; } = new();

    /// <summary>
    /// Discretisation for the intensity-volume histogram (IBSI 3.5). Default: fixed bin number 1000, which IBSI
    /// recommends for modalities with arbitrary intensity units such as MRI.
    /// </summary>
    public DiscretisationSettings IvhDiscretisation { get; init; } = new() { Method = DiscretisationMethod.FixedBinNumber, BinCount = 1000 };

    /// <summary>Texture matrix parameters (distances, NGLDM coarseness).</summary>
    public TextureSettings Texture { get; init; } = new();

    /// <summary>Which families to compute; all by default.</summary>
    public IReadOnlyList<FeatureFamily> Families { get; init; } = Enum.GetValues<FeatureFamily>();

    /// <summary>What to do with NaN/infinite intensities inside the ROI.</summary>
    public NonFinitePolicy NonFiniteIntensities { get; init; } = NonFinitePolicy.Reject;

    /// <summary>
    /// Moran's I and Geary's C cost O(N²) in ROI voxels; above this many voxels they are computed on a
    /// deterministic regular subsample of this many voxels (IBSI 3.1.24 allows approximation).
    /// </summary>
    public int SpatialAutocorrelationMaxVoxels { get; init; } = 5000;
}

/// <summary>Resampling to a new grid (IBSI 2.4, "align grid centres").</summary>
public sealed record ResamplingSettings
{
    /// <summary>New spacing in mm along index axes x, y, z; a null entry keeps that axis (e.g. 2D in-plane only).</summary>
    public double?[] SpacingMm { get; init; } = [1.0, 1.0, 1.0];

    /// <summary>Interpolation of intensities.</summary>
    public InterpolationMethod Interpolation { get; init; } = InterpolationMethod.Linear;

    /// <summary>Interpolation of the ROI mask before re-binarisation.</summary>
    public InterpolationMethod MaskInterpolation { get; init; } = InterpolationMethod.Linear;

    /// <summary>Interpolated mask values at or above this become ROI (IBSI: 0.5).</summary>
    public double PartialVolumeThreshold { get; init; } = 0.5;

    /// <summary>Round interpolated intensities to integers (IBSI does this for CT in HU).</summary>
    public bool RoundIntensities { get; init; }
}

/// <summary>Re-segmentation of the intensity mask (IBSI 2.5).</summary>
public sealed record ResegmentationSettings
{
    /// <summary>Keep intensities ≥ this (inclusive); null = no lower bound.</summary>
    public double? RangeMin { get; init; }

    /// <summary>Keep intensities ≤ this (inclusive); null = no upper bound.</summary>
    public double? RangeMax { get; init; }

    /// <summary>Drop intensities outside mean ± 3 SD of the ROI (IBSI "outlier filtering").</summary>
    public bool OutlierFilter3Sd { get; init; }
}

/// <summary>Intensity discretisation (IBSI 2.7).</summary>
public sealed record DiscretisationSettings
{
    public DiscretisationMethod Method { get; init; } = DiscretisationMethod.FixedBinNumber;

    /// <summary>Number of bins for <see cref="DiscretisationMethod.FixedBinNumber"/>.</summary>
    public int BinCount { get; init; } = 32;

    /// <summary>Bin width (intensity units) for <see cref="DiscretisationMethod.FixedBinSize"/>.</summary>
    public double BinWidth { get; init; } = 25;

    /// <summary>
    /// Lower edge of the first bin for fixed bin size; null uses the re-segmentation range minimum if set,
    /// else the ROI minimum (IBSI 2.7.2).
    /// </summary>
    public double? LowerBound { get; init; }
}

/// <summary>Texture matrix parameters (IBSI 3.6–3.11).</summary>
public sealed record TextureSettings
{
    /// <summary>GLCM Chebyshev distance δ.</summary>
    public int GlcmDistance { get; init; } = 1;

    /// <summary>NGTDM and NGLDM neighbourhood Chebyshev distance δ.</summary>
    public int NeighbourhoodDistance { get; init; } = 1;

    /// <summary>NGLDM coarseness parameter α.</summary>
    public int NgldmCoarseness { get; init; }

    /// <summary>Aggregations to emit: 2D, 2.5D and/or 3D (IBSI 3.1).</summary>
    public IReadOnlyList<TextureDimension> Dimensions { get; init; } = Enum.GetValues<TextureDimension>();
}

[JsonConverter(typeof(JsonStringEnumConverter<InterpolationMethod>))]
public enum InterpolationMethod { Nearest, Linear }

[JsonConverter(typeof(JsonStringEnumConverter<DiscretisationMethod>))]
public enum DiscretisationMethod
{
    /// <summary>IBSI fixed bin number (FBN): X_d = ⌊N_g (X − X_min)/(X_max − X_min)⌋ + 1, X_max → N_g.</summary>
    FixedBinNumber,

    /// <summary>IBSI fixed bin size (FBS): X_d = ⌊(X − X_min)/w_b⌋ + 1.</summary>
    FixedBinSize,

    /// <summary>Intensities are already discrete: rounded values are used directly (levels from the ROI minimum, step 1).</summary>
    None,
}

[JsonConverter(typeof(JsonStringEnumConverter<NonFinitePolicy>))]
public enum NonFinitePolicy
{
    /// <summary>Refuse the input with an error naming the count and first voxel.</summary>
    Reject,

    /// <summary>Drop non-finite voxels from the intensity mask (the morphological mask keeps them).</summary>
    Exclude,
}

[JsonConverter(typeof(JsonStringEnumConverter<TextureDimension>))]
public enum TextureDimension { TwoD, TwoPointFiveD, ThreeD }

[JsonConverter(typeof(JsonStringEnumConverter<FeatureFamily>))]
public enum FeatureFamily
{
    Morphology, LocalIntensity, IntensityStatistics, IntensityHistogram, IntensityVolumeHistogram,
    Glcm, Glrlm, Glszm, Gldzm, Ngtdm, Ngldm,
}
