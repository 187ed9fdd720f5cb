using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io;

/// <summary>What a series is for in a prostate exam.</summary>
public enum SeriesRole
{
    /// <summary>T2-weighted anatomical images.</summary>
    T2w,

    /// <summary>Apparent diffusion coefficient map (10^-6 mm^2/s).</summary>
    Adc,

    /// <summary>Diffusion-weighted images at one or more b-values (acquired or computed).</summary>
    Dwi,

    /// <summary>Anything else (localisers, DCE, T1w …).</summary>
    Other,
}

/// <summary>Acquisition parameters used for comparability checks; null when not recorded.</summary>
public sealed record AcquisitionInfo(
    double? FieldStrengthT = null,
    string? Manufacturer = null,
    string? Model = null,
    double? RepetitionTimeMs = null,
    double? EchoTimeMs = null,
    double? SliceThicknessMm = null,
    string? SeriesDescription = null,
    string? Modality = null);

/// <summary>One series (or one stack of a series) as <c>serimetry inspect</c> lists it.</summary>
/// <param name="SeriesInstanceUid">DICOM Series Instance UID; for NIfTI a name derived from the file.</param>
/// <param name="Role">Assigned role.</param>
/// <param name="Size">Voxels along x, y, z.</param>
/// <param name="SpacingMm">Spacing along x, y, z (z from slice positions, not Slice Thickness).</param>
/// <param name="OriginMm">LPS position of voxel (0,0,0).</param>
/// <param name="Direction">Direction cosines; columns are the x, y, z axes.</param>
/// <param name="BValues">b-values in s/mm^2, ascending; empty when not diffusion.</param>
/// <param name="Acquisition">Acquisition parameters.</param>
/// <param name="Source">Where it was read from (a path relative to the inspected root).</param>
/// <param name="Warnings">Anything unusual found while assembling it (gaps, non-uniform spacing, unknown b-values).</param>
public sealed record SeriesSummary(
    string SeriesInstanceUid,
    SeriesRole Role,
    Size3 Size,
    Vec3 SpacingMm,
    Vec3 OriginMm,
    Mat3 Direction,
    IReadOnlyList<double> BValues,
    AcquisitionInfo Acquisition,
    string Source,
    IReadOnlyList<string> Warnings);

/// <summary>One study (exam) with its series.</summary>
public sealed record StudySummary(
    string? StudyInstanceUid,
    string? PatientId,
    string? StudyDate,
    IReadOnlyList<SeriesSummary> Series);

/// <summary>Where a visit's ADC map came from.</summary>
public enum AdcSource
{
    /// <summary>Computed by the scanner (an ADC series in the exam).</summary>
    Scanner,

    /// <summary>Computed by Serimetry from the exam's DWI series.</summary>
    Computed,
}
