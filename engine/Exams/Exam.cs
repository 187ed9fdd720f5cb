using Serimetry.Engine.Core;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Exams;

/// <summary>One visit's images in memory, with the facts used for comparability checks.</summary>
/// <param name="Label">A short label for messages (e.g. the folder name); never a patient identifier.</param>
/// <param name="PatientId">Patient ID from the data (compared between exams; never logged).</param>
/// <param name="Date">Exam date.</param>
/// <param name="StudyInstanceUid">DICOM Study Instance UID when known.</param>
/// <param name="T2w">T2-weighted volume.</param>
/// <param name="Adc">ADC map in 10^-6 mm²/s on its own grid.</param>
/// <param name="AdcSource">Scanner or computed ADC.</param>
/// <param name="BValues">DWI b-values (s/mm²) of the exam, ascending; empty when unknown.</param>
/// <param name="T2wAcquisition">Acquisition parameters of the T2w series.</param>
/// <param name="AdcAcquisition">Acquisition parameters of the diffusion series.</param>
public sealed record Exam(
    string Label,
    string? PatientId,
    DateOnly Date,
    string? StudyInstanceUid,
    Volume<float> T2w,
    Volume<float> Adc,
    AdcSource AdcSource,
    IReadOnlyList<double> BValues,
    AcquisitionInfo T2wAcquisition,
    AcquisitionInfo AdcAcquisition);
