using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Series;

namespace Serimetry.Engine.Compare;

/// <summary>
/// IBSI chapter 1 features per visit (docs/radiomics.md) on the re-fitted lesion and on the whole gland, in
/// T2w (on its own grid) and in ADC (the scanner's samples, outline carried onto the ADC grid by nearest
/// neighbour). Regions are named <c>lesion.t2w</c>, <c>gland.t2w</c>, <c>lesion.adc</c>, <c>gland.adc</c>; the gland
/// regions matter for men whose cancer is not visible. A region that cannot be computed (empty, one voxel) is
/// left out with a note.
/// </summary>
internal static class VisitRadiomics
{
    public static IReadOnlyList<VisitFeatures> Extract(IReadOnlyList<VisitImages> visits, RadiomicsSettings settings, List<string> notes)
    {
        var result = new List<VisitFeatures>();
        foreach (var v in visits)
        {
            var lesion = v.Lesion?.Mask ?? v.PropagatedLesion;
            foreach (var (region, image, mask) in new (string, Volume<float>, Volume<byte>?)[]
                     {
                         ("lesion.t2w", v.Exam.T2w, lesion), ("gland.t2w", v.Exam.T2w, v.Gland),
                         ("lesion.adc", v.AdcInT2wFrame, lesion), ("gland.adc", v.AdcInT2wFrame, v.Gland),
                     })
            {
                if (mask is null) continue;
                try
                {
                    var onGrid = MaskGrid.OnGrid(mask, image.Geometry);
                    var features = RadiomicsExtractor.Extract(image, onGrid, settings with { NonFiniteIntensities = NonFinitePolicy.Exclude });
                    result.Add(new VisitFeatures(v.Index.ToString(CultureInfo.InvariantCulture), v.Exam.Date, region, features));
                }
                catch (InputException e)
                {
                    notes.Add($"visit {v.Index}: radiomics of {region} skipped: {e.Message}");
                }
            }
        }
        return result;
    }

    /// <summary>Writes <c>radiomics.csv</c> (long format over visits) and <c>radiomics-deltas-visit-K.csv</c> per follow-up.</summary>
    public static IReadOnlyList<string> Write(IReadOnlyList<VisitFeatures> features, string outDir)
    {
        var written = new List<string> { "radiomics.csv" };
        using (var w = new StreamWriter(Path.Combine(outDir, "radiomics.csv")))
            RadiomicsTimeSeries.WriteLong(w, features);
        foreach (var followup in features.Select(f => f.VisitId).Distinct().Where(id => id != "0"))
        {
            var deltas = features.Where(f => f.VisitId == followup)
                .SelectMany(f => features.Where(b => b.VisitId == "0" && b.Region == f.Region).SelectMany(b => RadiomicsTimeSeries.Deltas(b, f)))
                .ToList();
            var name = $"radiomics-deltas-visit-{followup}.csv";
            using var w = new StreamWriter(Path.Combine(outDir, name));
            RadiomicsTimeSeries.WriteDeltas(w, deltas);
            written.Add(name);
        }
        return written;
    }
}
