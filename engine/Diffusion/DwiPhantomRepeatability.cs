using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Diffusion;

/// <summary>
/// Repeatability of phantom ADC across repeated acquisitions (QIBA phantom QA: short-term repeatability, facts.md
/// §2): each vial is a subject, each acquisition a repeat, the vial mean ADC the value; the result is the usual
/// test-retest statistics (wSD, wCV, RC, and ICCs when there are several vials) of measure <c>phantom.adc</c>.
/// </summary>
public static class DwiPhantomRepeatability
{
    /// <summary>Statistics over two or more phantom check reports of the same phantom (vials matched by label).</summary>
    public static MeasureRepeatability Analyse(IReadOnlyList<DwiPhantomReport> acquisitions)
    {
        ArgumentNullException.ThrowIfNull(acquisitions);
        if (acquisitions.Count < 2)
            throw new Core.InvalidParameterException($"repeatability needs at least two acquisitions, got {acquisitions.Count}", "DWI phantom",
                "scan the phantom again (several scans after equilibrium) and give every scan");
        var rows = new List<RepeatabilityObservation>();
        for (int a = 0; a < acquisitions.Count; a++)
            foreach (var v in acquisitions[a].Vials)
                rows.Add(new RepeatabilityObservation($"vial {v.Label}", "phantom.adc", $"scan {a + 1}", v.MeanAdcUm2PerS));
        return TestRetestAnalysis.AnalyseMeasure("phantom.adc", rows);
    }
}
