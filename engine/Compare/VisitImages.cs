using Serimetry.Engine.Core;
using Serimetry.Engine.Exams;
using Serimetry.Engine.Registration;

namespace Serimetry.Engine.Compare;

/// <summary>
/// One visit after alignment, on its own T2w grid: ADC resampled onto it through the within-exam
/// transform (for the re-fit and pictures), the ADC map with its geometry moved by that transform into the
/// T2w frame (its voxels untouched, for the ADC measures), the baseline outlines carried onto it, and the
/// re-fitted lesion.
/// </summary>
internal sealed record VisitImages(
    int Index,
    Exam Exam,
    Volume<float> AdcOnT2w,
    Volume<float> AdcInT2wFrame,
    RegistrationResult? WithinExam,
    RegistrationResult? ToBaseline,
    Volume<byte>? Gland,
    Volume<byte>? PropagatedLesion,
    LesionRefitResult? Lesion,
    IReadOnlyList<string> Flags)
{
    /// <summary>Gland volume of this visit ÷ baseline, from the Jacobian of a deformable alignment; null otherwise.</summary>
    public double? GlandVolumeRatio { get; init; }
}
