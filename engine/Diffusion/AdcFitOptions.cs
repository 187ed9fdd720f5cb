using Serimetry.Engine.Core;

namespace Serimetry.Engine.Diffusion;

/// <summary>How the mono-exponential S(b) = S0·exp(−b·ADC) is fitted per voxel.</summary>
public enum AdcFitMethod
{
    /// <summary>Ordinary least squares on ln S (log-linear); unbiased only at high SNR.</summary>
    LogLinear,

    /// <summary>Weighted least squares on ln S with weights S² of the measured signal (var(ln S) ≈ σ²/S²).</summary>
    WeightedLogLinear,

    /// <summary>
    /// Non-linear least squares on S (Levenberg-Marquardt, started from the weighted fit) of the
    /// noise-floor-aware model S(b) = √((S0·exp(−b·ADC))² + σ²) when <see cref="AdcFitOptions.NoiseSigma"/> &gt; 0
    /// (a first-moment approximation of the Rician mean), else the plain mono-exponential.
    /// </summary>
    NonLinear,
}

/// <summary>Options of <see cref="AdcFitter"/>; recorded in every result.</summary>
/// <param name="Method">Fit method.</param>
/// <param name="MinBValue">Images with b below this (s/mm²) are excluded to limit perfusion effects (default 200).</param>
/// <param name="BValues">If given, exactly these b-values are used (each must be present); overrides <paramref name="MinBValue"/>.</param>
/// <param name="NoiseSigma">Gaussian SD of the magnitude noise (signal units); 0 = unknown (no floor handling).</param>
/// <param name="FloorFactor">In the log fits, points with S &lt; FloorFactor·σ are excluded (at the noise floor ln S is biased) and the others corrected to √(S² − σ²); default 2.</param>
/// <param name="MaxAdcUm2PerS">Fitted values are clamped to [0, this] (10⁻⁶ mm²/s); default 5000.</param>
/// <param name="MaxDegreeOfParallelism">Threads (−1 = all); results do not depend on it.</param>
public sealed record AdcFitOptions(
    AdcFitMethod Method = AdcFitMethod.WeightedLogLinear,
    double MinBValue = 200,
    IReadOnlyList<double>? BValues = null,
    double NoiseSigma = 0,
    double FloorFactor = 2,
    double MaxAdcUm2PerS = 5000,
    int MaxDegreeOfParallelism = -1)
{
    internal void Validate()
    {
        if (!(MinBValue >= 0) || !double.IsFinite(MinBValue))
            throw new InvalidParameterException($"minimum b-value {MinBValue} must be ≥ 0", "ADC fit options");
        if (!(NoiseSigma >= 0) || !double.IsFinite(NoiseSigma))
            throw new InvalidParameterException($"noise sigma {NoiseSigma} must be ≥ 0", "ADC fit options");
        if (!(FloorFactor >= 0) || !(MaxAdcUm2PerS > 0))
            throw new InvalidParameterException("floor factor must be ≥ 0 and the maximum ADC positive", "ADC fit options");
    }
}

/// <summary>One diffusion-weighted image and its b-value (s/mm², DICOM (0018,9087) Diffusion b-value).</summary>
public sealed record DwiImage(double BValue, Volume<float> Image);

/// <summary>Result of an ADC fit.</summary>
/// <param name="AdcUm2PerS">ADC in 10⁻⁶ mm²/s (µm²/s), like scanner maps; 0 outside the mask and where the fit failed.</param>
/// <param name="S0">Fitted signal at b = 0.</param>
/// <param name="RSquared">Goodness of fit per voxel: R² of the fitted vs measured signal over the b-values used (0 where not fitted).</param>
/// <param name="BValuesUsed">Distinct b-values used, ascending.</param>
/// <param name="Options">The options used.</param>
/// <param name="VoxelsFitted">Voxels with a successful fit.</param>
/// <param name="VoxelsFailed">Voxels in the mask with fewer than two usable points (non-positive or floor signals).</param>
/// <param name="VoxelsClamped">Voxels whose fitted ADC was clamped into [0, MaxAdcUm2PerS].</param>
public sealed record AdcMapResult(
    Volume<float> AdcUm2PerS,
    Volume<float> S0,
    Volume<float> RSquared,
    IReadOnlyList<double> BValuesUsed,
    AdcFitOptions Options,
    long VoxelsFitted,
    long VoxelsFailed,
    long VoxelsClamped);
