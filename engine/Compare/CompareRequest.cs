using Serimetry.Engine.Change;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Compare;

/// <summary>Everything a comparison needs. Paths are read by the pipeline; nothing is written until the end.</summary>
/// <param name="BaselineExam">Baseline exam (folder with exam.json).</param>
/// <param name="FollowupExams">Follow-up exams, any order (sorted by date).</param>
/// <param name="GlandMask">Baseline gland outline (NIfTI), or null to use the exam's own.</param>
/// <param name="LesionMask">Baseline lesion outline (NIfTI), or null to use the exam's own (none: whole-gland measures only).</param>
/// <param name="Psa">PSA values with dates.</param>
/// <param name="Profile">Repeatability profile for the 95 % bands.</param>
/// <param name="Options">Processing options.</param>
public sealed record CompareRequest(
    string BaselineExam,
    IReadOnlyList<string> FollowupExams,
    string? GlandMask,
    string? LesionMask,
    IReadOnlyList<PsaSample> Psa,
    RepeatabilityProfile Profile,
    ComparisonOptions Options);

/// <summary>Processing options of a comparison, recorded in change.json.</summary>
/// <param name="AllowDifferentPatients">Compare exams whose patient IDs differ (refused by default).</param>
/// <param name="FollowupPreset">Registration preset for follow-up T2w → baseline T2w.</param>
/// <param name="WithinExamPreset">Registration preset for ADC → T2w inside each exam, or null to trust the scanner geometry.</param>
/// <param name="Refit">Lesion re-fit settings.</param>
/// <param name="MaxThreads">Threads for parallel loops (-1: all cores).</param>
/// <param name="PluginFolder">Folder of measure plugin assemblies to load beside the built-ins, or null.</param>
/// <param name="Radiomics">IBSI feature settings for the per-visit radiomics, or null to skip them.</param>
/// <param name="RadiomicsRobustness">Test-retest reliabilities that decide which features feed the radiomic deltas, or null
/// (unfiltered, said in the outputs).</param>
public sealed record ComparisonOptions(
    bool AllowDifferentPatients = false,
    string FollowupPreset = "rigid",
    string? WithinExamPreset = "within-exam",
    LesionRefitSettings? Refit = null,
    int MaxThreads = -1,
    string? PluginFolder = null,
    Radiomics.RadiomicsSettings? Radiomics = null,
    Radiomics.Robustness.RobustnessReference? RadiomicsRobustness = null)
{
    public LesionRefitSettings RefitSettings => Refit ?? new LesionRefitSettings();
}

/// <summary>Progress of a comparison: stage name and overall fraction done.</summary>
public sealed record CompareProgress(string Stage, double Fraction);
