using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Phantoms;

/// <summary>What the phantom was built from at one visit (the truth a measurement is checked against).</summary>
/// <param name="BaselineToVisit">True rigid transform: maps a baseline LPS point (mm) to the same anatomical point in this visit (registration convention: fixed = baseline → moving = visit).</param>
/// <param name="LesionVolumeMl">Analytic lesion volume 4/3·π·r³ (mL).</param>
/// <param name="LesionVolumeVoxelisedMl">Lesion mask voxel count × voxel volume on the T2w grid (mL).</param>
/// <param name="GlandVolumeMl">Analytic gland volume 4/3·π·a·b·c (mL).</param>
/// <param name="GlandVolumeVoxelisedMl">Gland mask voxel count × voxel volume on the T2w grid (mL).</param>
/// <param name="LesionRadiusMm">Lesion radius at this visit.</param>
/// <param name="LesionCentreMm">Lesion centre in this visit's LPS frame.</param>
/// <param name="GlandCentreMm">Gland centre in this visit's LPS frame.</param>
/// <param name="LesionAdcUm2PerS">True lesion ADC (10⁻⁶ mm²/s).</param>
/// <param name="TissueAdcUm2PerS">True ADC per tissue (10⁻⁶ mm²/s).</param>
/// <param name="Snr">T2w SNR (PZ signal / σ).</param>
/// <param name="DwiSnr">DWI SNR at b = 0 (PZ S0 / σ).</param>
/// <param name="PsaNgPerMl">PSA of the invented subject at this visit (ng/mL), or null.</param>
/// <param name="Date">Exam date.</param>
/// <param name="Deformation">Mild deformation on top of <paramref name="BaselineToVisit"/>, or null (rigid only).</param>
public sealed record PhantomVisitTruth(
    AffineTransform BaselineToVisit,
    double LesionVolumeMl,
    double LesionVolumeVoxelisedMl,
    double GlandVolumeMl,
    double GlandVolumeVoxelisedMl,
    double LesionRadiusMm,
    Vec3 LesionCentreMm,
    Vec3 GlandCentreMm,
    double LesionAdcUm2PerS,
    IReadOnlyDictionary<string, double> TissueAdcUm2PerS,
    double Snr,
    double DwiSnr,
    double? PsaNgPerMl,
    DateOnly Date,
    PhantomDeformation? Deformation = null);

/// <summary>One generated exam.</summary>
/// <param name="Index">Visit index (0 = baseline).</param>
/// <param name="Date">Exam date.</param>
/// <param name="T2w">T2-weighted volume (oblique axial, anisotropic).</param>
/// <param name="Dwi">DWI volumes per b-value on the coarser DWI grid.</param>
/// <param name="Adc">Scanner-style ADC map (10⁻⁶ mm²/s) fitted from <paramref name="Dwi"/> on the DWI grid.</param>
/// <param name="GlandMask">Gland mask (1 inside) on the T2w grid.</param>
/// <param name="ZoneMask">Zones on the T2w grid: 1 = peripheral zone, 2 = transition zone.</param>
/// <param name="LesionMask">Lesion mask (1 inside) on the T2w grid.</param>
/// <param name="T2wAcquisition">T2w acquisition parameters.</param>
/// <param name="DwiAcquisition">DWI acquisition parameters.</param>
/// <param name="Truth">Ground truth of this visit.</param>
public sealed record PhantomVisit(
    int Index,
    DateOnly Date,
    Volume<float> T2w,
    IReadOnlyList<DwiImage> Dwi,
    Volume<float> Adc,
    Volume<byte> GlandMask,
    Volume<byte> ZoneMask,
    Volume<byte> LesionMask,
    AcquisitionInfo T2wAcquisition,
    AcquisitionInfo DwiAcquisition,
    PhantomVisitTruth Truth);

/// <summary>A generated subject: its spec and its visits.</summary>
public sealed record PhantomSubject(string SubjectId, PhantomSpec Spec, IReadOnlyList<PhantomVisit> Visits);
