using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Registration;

namespace Serimetry.Engine.Compare;

/// <summary>
/// One visit after alignment, on its own T2w grid: ADC resampled onto it through the within-exam
/// transform, the baseline outlines carried onto it, and the re-fitted lesion.
/// </summary>
internal sealed record VisitImages(
    int Index,
    Exam Exam,
    Volume<float> AdcOnT2w,
    RegistrationResult? WithinExam,
    RegistrationResult? ToBaseline,
    Volume<byte>? Gland,
    Volume<byte>? PropagatedLesion,
    LesionRefitResult? Lesion,
    IReadOnlyList<string> Flags);
